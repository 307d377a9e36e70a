import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import { and, desc, eq, isNull } from 'drizzle-orm';
import { db } from './db';
import { apiTokens } from './db/schema';
import { recordAudit } from './audit';
import * as people from './people';
import { announcePersonChanged, tokenCache } from './token-cache';
import { TOKEN_DEFAULT_DAYS } from '$lib/schemas/people';

const PREFIX = 'jct_';

function hash(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

/**
 * Creates a personal token; the secret is returned once and only its hash is kept. The
 * token is refused from `expiresAt` on (checked on every request); TOKEN_DEFAULT_DAYS
 * from now unless given.
 */
export async function create(userId: string, name: string, actorId: string | null = userId, expiresAt: Date = new Date(Date.now() + TOKEN_DEFAULT_DAYS * 86_400_000)) {
	const token = PREFIX + randomBytes(32).toString('base64url');
	return db.transaction(async (tx) => {
		const [row] = await tx
			.insert(apiTokens)
			.values({ userId, name, tokenHash: hash(token), prefix: token.slice(0, PREFIX.length + 6), expiresAt })
			.returning({ id: apiTokens.id, name: apiTokens.name, createdAt: apiTokens.createdAt, expiresAt: apiTokens.expiresAt });
		await recordAudit(tx, {
			actorId,
			action: 'token.created',
			entity: 'api-token',
			entityId: row.id,
			detail: { userId, name, expiresAt: expiresAt.toISOString() }
		});
		return { ...row, token };
	});
}

export async function listFor(userId: string) {
	return db
		.select({
			id: apiTokens.id,
			name: apiTokens.name,
			prefix: apiTokens.prefix,
			createdAt: apiTokens.createdAt,
			lastUsedAt: apiTokens.lastUsedAt,
			revokedAt: apiTokens.revokedAt,
			expiresAt: apiTokens.expiresAt
		})
		.from(apiTokens)
		.where(eq(apiTokens.userId, userId))
		.orderBy(desc(apiTokens.createdAt));
}

export async function revoke(userId: string, tokenId: number): Promise<boolean> {
	const revoked = await db.transaction(async (tx) => {
		const rows = await tx
			.update(apiTokens)
			.set({ revokedAt: new Date() })
			.where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
			.returning({ id: apiTokens.id });
		if (rows.length) {
			await recordAudit(tx, { actorId: userId, action: 'token.revoked', entity: 'api-token', entityId: tokenId });
			await announcePersonChanged(tx, userId);
		}
		return rows.length > 0;
	});
	if (revoked) tokenCache.forgetPerson(userId);
	return revoked;
}

/**
 * The person a bearer token belongs to, or null for an unknown, forged, revoked or expired
 * token, or a deactivated person. Known tokens are answered from memory (token-cache.ts:
 * emptied of a person the moment their access changes); the end date is checked every time.
 */
export async function resolve(token: string): Promise<people.Person | null> {
	if (!token.startsWith(PREFIX) || token.length > 200) return null;
	const digest = hash(token);
	let entry = tokenCache.get(digest);
	if (!entry) {
		const readAt = tokenCache.current;
		const found = await people.findByTokenHash(digest);
		// The lookup is by hash, so timing reveals nothing of the secret; compare anyway.
		if (!found || !timingSafeEqual(Buffer.from(found.tokenHash), Buffer.from(digest))) return null;
		entry = { person: found.person, tokenId: found.tokenId, expiresAt: found.expiresAt?.getTime() ?? null, lastUsedAt: found.lastUsedAt?.getTime() ?? null };
		tokenCache.set(digest, entry, readAt);
	}
	const now = Date.now();
	if (entry.expiresAt !== null && entry.expiresAt <= now) return null;
	// Last use is recorded at most once a minute, so reads stay reads.
	if (entry.lastUsedAt === null || now - entry.lastUsedAt > 60_000) {
		entry.lastUsedAt = now;
		await db.update(apiTokens).set({ lastUsedAt: new Date(now) }).where(eq(apiTokens.id, entry.tokenId));
	}
	return entry.person;
}
