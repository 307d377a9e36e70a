// Shared counters and clean-up in PostgreSQL: the sign-in limit counts in the database (so
// every app process shares it, and hits at the same moment cannot both slip in), and
// pruning removes expired sessions, sign-in links and finished limit windows only.
import { eq, inArray } from 'drizzle-orm';
import { expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { rateLimits, sessions, verificationTokens } from '$lib/server/db/schema';
import { pruneExpired } from '$lib/server/prune';
import { hitLimit } from '$lib/server/rate-limit';
import { personFor, unique } from './helpers';

test('a window allows max hits, refuses the next, and opens again when it has passed', async () => {
	const key = unique('limit');
	const results = [];
	for (let i = 0; i < 4; i++) results.push(await hitLimit(key, 3, 800));
	expect(results).toEqual([true, true, true, false]);
	await new Promise((r) => setTimeout(r, 900));
	expect(await hitLimit(key, 3, 800)).toBe(true);
	const [row] = await db.select().from(rateLimits).where(eq(rateLimits.key, key));
	expect(row.hits).toBe(1);
});

test('twenty hits at the same moment: exactly the allowed five get through', async () => {
	const key = unique('burst');
	const results = await Promise.all(Array.from({ length: 20 }, () => hitLimit(key, 5, 60_000)));
	expect(results.filter(Boolean)).toHaveLength(5);
});

test('pruning deletes what expired and keeps what is live', async () => {
	const person = await personFor('designer');
	const now = new Date();
	const past = new Date(now.getTime() - 1000);
	const future = new Date(now.getTime() + 3600_000);
	const [dead, live] = [unique('dead'), unique('live')];
	await db.insert(sessions).values([
		{ sessionToken: dead, userId: person.id, expires: past },
		{ sessionToken: live, userId: person.id, expires: future }
	]);
	await db.insert(verificationTokens).values([
		{ identifier: person.email, token: dead, expires: past },
		{ identifier: person.email, token: live, expires: future }
	]);
	await db.insert(rateLimits).values([
		{ key: dead, hits: 3, windowEndsAt: past },
		{ key: live, hits: 3, windowEndsAt: future }
	]);
	const pruned = await pruneExpired(now);
	expect(pruned.sessions).toBeGreaterThanOrEqual(1);
	expect(pruned.signInLinks).toBeGreaterThanOrEqual(1);
	expect(pruned.rateLimits).toBeGreaterThanOrEqual(1);
	const keys = [dead, live];
	expect((await db.select().from(sessions).where(inArray(sessions.sessionToken, keys))).map((r) => r.sessionToken)).toEqual([live]);
	expect((await db.select().from(verificationTokens).where(inArray(verificationTokens.token, keys))).map((r) => r.token)).toEqual([live]);
	expect((await db.select().from(rateLimits).where(inArray(rateLimits.key, keys))).map((r) => r.key)).toEqual([live]);
});
