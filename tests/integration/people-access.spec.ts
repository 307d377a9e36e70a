// An admin's changes to people, against the running app and the database: role changes
// only once confirmed, deactivation ending sessions and tokens in one step (history kept),
// token end dates enforced on every request, and the audit page's filters and pages.
import { describe, expect, test } from 'vitest';
import { and, eq, gt } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import { db } from '$lib/server/db';
import { apiTokens, auditLog, sessions, userRoles, users } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { APP_URL, browse, unique } from './helpers';

async function newPerson(roles: ('designer' | 'lead')[] = ['designer']) {
	return people.upsert({ email: `${unique('p')}@demo.test`, name: `Orla ${unique('Quenby')}`, roles }, null);
}

/** A session cookie for any person (as Auth.js writes it after sign-in). */
async function sessionOf(userId: string): Promise<string> {
	const sessionToken = randomBytes(24).toString('hex');
	await db.insert(sessions).values({ sessionToken, userId, expires: new Date(Date.now() + 3600_000) });
	return `authjs.session-token=${sessionToken}`;
}

const withToken = (token: string) => fetch(`${APP_URL}/api/v1/junctions?limit=1`, { headers: { authorization: `Bearer ${token}` } }).then((r) => r.status);
const withCookie = (cookie: string) => fetch(`${APP_URL}/account/tokens`, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' }).then((r) => r.status);

describe('role changes', () => {
	test('the first post only asks; the confirmed one changes and records the role', async () => {
		const p = await newPerson();
		const asked = await browse('/admin?/role', { as: 'admin', form: { userId: p.id, role: 'lead', grant: '1' } });
		expect(asked.status).toBe(200);
		expect(await db.select().from(userRoles).where(and(eq(userRoles.userId, p.id), eq(userRoles.role, 'lead')))).toEqual([]);
		const done = await browse('/admin?/role', { as: 'admin', form: { userId: p.id, role: 'lead', grant: '1', confirm: '1' } });
		expect(done.status).toBe(200);
		expect(done.text).toContain(`${p.name} now holds the lead role.`);
		expect((await people.findById(p.id))!.roles).toEqual(['designer', 'lead']);
		const again = await browse('/admin?/role', { as: 'admin', form: { userId: p.id, role: 'lead', grant: '1', confirm: '1' } });
		expect(again.text).toContain(`${p.name} already held the lead role; nothing changed.`);
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entityId, p.id), eq(auditLog.action, 'role.granted')));
		expect(audits).toHaveLength(1);
	});
});

describe('deactivating a person', () => {
	test('ends every session and token at once, refuses sign-in, keeps their history; reactivating lets them back', async () => {
		const p = await newPerson();
		const cookie = await sessionOf(p.id);
		const a = await tokens.create(p.id, 'bench PC', p.id);
		const b = await tokens.create(p.id, 'script', p.id);
		expect(await withToken(a.token)).toBe(200);
		expect(await withCookie(cookie)).toBe(200);

		const asked = await browse('/admin?/deactivate', { as: 'admin', form: { userId: p.id } });
		expect(asked.status).toBe(200);
		expect((await people.findById(p.id))!.deactivatedAt).toBeNull();
		const done = await browse('/admin?/deactivate', { as: 'admin', form: { userId: p.id, confirm: '1' } });
		expect(done.status).toBe(200);
		expect(done.text).toContain(`${p.name} is deactivated: signed out everywhere, every API token revoked.`);

		expect(await withToken(a.token)).toBe(401);
		expect(await withToken(b.token)).toBe(401);
		expect(await withCookie(cookie)).toBe(303);
		expect(await db.select().from(sessions).where(eq(sessions.userId, p.id))).toEqual([]);
		expect((await db.select().from(apiTokens).where(eq(apiTokens.userId, p.id))).every((t) => t.revokedAt !== null)).toBe(true);
		const [row] = await db.select().from(users).where(eq(users.id, p.id));
		expect(row.deactivatedAt).not.toBeNull();
		// Their history stays: the token rows and their audit rows are still there.
		expect(await db.select().from(auditLog).where(and(eq(auditLog.actorId, p.id), eq(auditLog.action, 'token.created')))).toHaveLength(2);
		const [audit] = await db.select().from(auditLog).where(and(eq(auditLog.entityId, p.id), eq(auditLog.action, 'person.deactivated')));
		expect(audit.detail).toMatchObject({ sessionsEnded: 1, tokensRevoked: 2 });
		// A session row made afterwards (say by a sign-in link mailed before) is refused too.
		expect(await withCookie(await sessionOf(p.id))).toBe(303);
		expect(people.maySignIn(await people.findByEmail(p.email))).toBe(false);
		// Not a lead who can be named while deactivated.
		const lead = await newPerson(['lead']);
		await browse('/admin?/deactivate', { as: 'admin', form: { userId: lead.id, confirm: '1' } });
		expect((await people.listWithRole('lead')).map((x) => x.id)).not.toContain(lead.id);

		const back = await browse('/admin?/reactivate', { as: 'admin', form: { userId: p.id, confirm: '1' } });
		expect(back.text).toContain(`${p.name} can sign in again.`);
		expect(people.maySignIn(await people.findByEmail(p.email))).toBe(true);
		expect(await withToken(a.token)).toBe(401);
		expect(await withCookie(await sessionOf(p.id))).toBe(200);
	});

	test('an admin cannot deactivate themselves, and twice is refused', async () => {
		const admin = await people.findByEmail('admin@demo.test');
		const self = await browse('/admin?/deactivate', { as: 'admin', form: { userId: admin!.id, confirm: '1' } });
		expect(self.status).toBe(400);
		expect(self.text).toContain('You cannot deactivate yourself; ask another admin.');
		const p = await newPerson();
		await people.deactivate(p.id, admin!.id);
		const twice = await browse('/admin?/deactivate', { as: 'admin', form: { userId: p.id, confirm: '1' } });
		expect(twice.status).toBe(409);
		expect(twice.text).toContain(`${p.name} is already deactivated.`);
	});
});

describe('API token end dates', () => {
	test('a token is refused from the instant it expires, checked on every request', async () => {
		const p = await newPerson();
		// The end date the server read with the token, not a later edit of the row, decides: let it pass.
		const endsAt = Date.now() + 1500;
		const t = await tokens.create(p.id, 'short-lived', p.id, new Date(endsAt));
		expect(await withToken(t.token)).toBe(200);
		await new Promise((r) => setTimeout(r, endsAt - Date.now() + 50));
		expect(await withToken(t.token)).toBe(401);
	});

	test('the tokens page gives a last day (90 days unless chosen) and refuses one past a year or already over', async () => {
		const before = Date.now();
		const made = await browse('/account/tokens?/create', { as: 'designer', form: { name: unique('no date') } });
		expect(made.status).toBe(200);
		const designer = await people.findByEmail('designer@demo.test');
		const [latest] = await db
			.select()
			.from(apiTokens)
			.where(and(eq(apiTokens.userId, designer!.id), gt(apiTokens.createdAt, new Date(before - 1000))))
			.orderBy(apiTokens.id);
		const days = (latest.expiresAt!.getTime() - before) / 86_400_000;
		expect(days).toBeGreaterThan(89.9);
		expect(days).toBeLessThan(91.1);
		const far = await browse('/account/tokens?/create', { as: 'designer', form: { name: 'far', expires: '2099-01-01' } });
		expect(far.status).toBe(400);
		expect(far.text).toContain('A token lasts at most 366 days; choose an earlier day.');
		const past = await browse('/account/tokens?/create', { as: 'designer', form: { name: 'past', expires: '2020-01-01' } });
		expect(past.status).toBe(400);
		expect(past.text).toContain('That day is over; choose today or a later day.');
		const bad = await browse('/account/tokens?/create', { as: 'designer', form: { name: 'bad', expires: '2026-02-30' } });
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Give the last day it works as a calendar date.');
	});
});

describe('the audit page', () => {
	test('filters by person, action and day, and pages fifty at a time', async () => {
		const p = await newPerson();
		const admin = await people.findByEmail('admin@demo.test');
		await people.deactivate(p.id, admin!.id);
		const all = await browse('/admin/audit', { as: 'admin' });
		expect(all.status).toBe(200);
		const total = Number(/(\d+)<\/span> entries/.exec(all.text)?.[1]);
		expect(total).toBeGreaterThan(50);
		expect(all.text).toMatch(/page <span class="num">1<\/span> of <span class="num">\d+<\/span>/);
		const second = await browse('/admin/audit?page=2', { as: 'admin' });
		expect(second.text).toMatch(/page <span class="num">2<\/span> of/);

		const today = new Date().toISOString().slice(0, 10);
		const filtered = await browse(`/admin/audit?person=${admin!.id}&action=person.deactivated&from=${today}&to=${today}`, { as: 'admin' });
		const entries = filtered.text.match(/data-testid="audit-entry" data-action="[^"]+"/g) ?? [];
		expect(entries.length).toBeGreaterThan(0);
		expect(entries.every((e) => e.endsWith('data-action="person.deactivated"'))).toBe(true);
		expect(filtered.text).toContain(`deactivated ${p.name} (0 sessions ended, 0 API tokens revoked)`);
		const none = await browse(`/admin/audit?action=person.deactivated&to=2001-01-01`, { as: 'admin' });
		expect(none.text).toContain('No entries match these filters.');
		const wrong = await browse('/admin/audit?from=2026-05-01&to=2026-04-01', { as: 'admin' });
		expect(wrong.text).toContain('The last day must not be before the first.');
	});
});
