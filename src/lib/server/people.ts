import { and, asc, eq, gt, inArray, isNotNull, isNull, or, sql } from 'drizzle-orm';
import { db, type DbOrTx, type Tx } from './db';
import { announcePersonChanged, tokenCache } from './token-cache';
import { apiTokens, sessions, userRoles, users } from './db/schema';
import { recordAudit } from './audit';
import { DomainError } from './errors';
import { enqueueMail } from './mail';
import { isRole, type Role } from '$lib/permissions';

/** A person with their roles; `deactivatedAt` is set while an admin has switched them off. */
export type Person = { id: string; email: string; name: string; roles: Role[]; deactivatedAt: Date | null };
/** A person as lists and records name them (a type the screens share). */
export type { PersonRef } from '$lib/projects/shortlist';
import type { PersonRef } from '$lib/projects/shortlist';

function normaliseEmail(email: string) {
	return email.trim().toLowerCase();
}

async function rolesOf(tx: DbOrTx, userIds: string[]): Promise<Map<string, Role[]>> {
	const map = new Map<string, Role[]>();
	if (userIds.length === 0) return map;
	const rows = await tx.select().from(userRoles).where(inArray(userRoles.userId, userIds));
	for (const r of rows) {
		if (!isRole(r.role)) continue;
		map.set(r.userId, [...(map.get(r.userId) ?? []), r.role]);
	}
	return map;
}

function toPerson(u: { id: string; email: string; name: string | null; deactivatedAt: Date | null }, roles: Role[] | undefined): Person {
	return { id: u.id, email: u.email, name: u.name ?? u.email, roles: (roles ?? []).sort(), deactivatedAt: u.deactivatedAt };
}

/** Roles gathered in the same query as the person (one round trip per request). */
const rolesColumn = sql<Role[] | null>`(select array_agg(${userRoles.role} order by ${userRoles.role}) from ${userRoles} where ${userRoles.userId} = ${users.id})`;

const personColumns = { id: users.id, email: users.email, name: users.name, deactivatedAt: users.deactivatedAt, roles: rolesColumn };

export async function findByEmail(email: string, tx: DbOrTx = db): Promise<Person | null> {
	const [row] = await tx.select(personColumns).from(users).where(eq(users.email, normaliseEmail(email)));
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

/** Whether this person (if any) may sign in: known to the team and not deactivated. */
export function maySignIn(person: Person | null): person is Person {
	return person !== null && person.deactivatedAt === null;
}

export async function findById(id: string, tx: DbOrTx = db): Promise<Person | null> {
	const [row] = await tx.select(personColumns).from(users).where(eq(users.id, id));
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

/** Runs on every page a browser asks for: built once and prepared, like the token lookup below. */
const bySessionToken = db
	.select(personColumns)
	.from(sessions)
	.innerJoin(users, eq(users.id, sessions.userId))
	.where(and(eq(sessions.sessionToken, sql.placeholder('token')), gt(sessions.expires, sql`now()`), isNull(users.deactivatedAt)))
	.prepare('people_by_session_token');

/** The person behind a browser session cookie, or null when absent, expired or deactivated. */
export async function findBySessionToken(token: string): Promise<Person | null> {
	const [row] = await bySessionToken.execute({ token });
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

/**
 * The token lookup runs on every API request: built once and prepared (named statement),
 * so a request neither rebuilds the query nor has PostgreSQL plan it again.
 */
const byTokenHash = db
	.select({ ...personColumns, tokenId: apiTokens.id, tokenHash: apiTokens.tokenHash, lastUsedAt: apiTokens.lastUsedAt, expiresAt: apiTokens.expiresAt })
	.from(apiTokens)
	.innerJoin(users, eq(users.id, apiTokens.userId))
	.where(
		and(
			eq(apiTokens.tokenHash, sql.placeholder('digest')),
			isNull(apiTokens.revokedAt),
			or(isNull(apiTokens.expiresAt), gt(apiTokens.expiresAt, sql`now()`)),
			isNull(users.deactivatedAt)
		)
	)
	.prepare('people_by_token_hash');

/** The active owner of an unrevoked, unexpired API token with this SHA-256, with the token's id, last use and end date. */
export async function findByTokenHash(digest: string) {
	const [row] = await byTokenHash.execute({ digest });
	if (!row) return null;
	return { person: toPerson(row, (row.roles ?? []).filter(isRole)), tokenId: row.tokenId, tokenHash: row.tokenHash, lastUsedAt: row.lastUsedAt, expiresAt: row.expiresAt };
}

/**
 * Runs a write that changes a person's access (roles, name, deactivation) in one
 * transaction that also announces it, then forgets the person's tokens in this process at
 * once (other processes on hearing the announcement).
 */
async function changingAccess<T>(userId: string | ((result: T) => string | null), write: (tx: Tx) => Promise<T>): Promise<T> {
	const result = await db.transaction(async (tx) => {
		const r = await write(tx);
		const id = typeof userId === 'string' ? userId : userId(r);
		if (id) await announcePersonChanged(tx, id);
		return r;
	});
	const id = typeof userId === 'string' ? userId : userId(result);
	if (id) tokenCache.forgetPerson(id);
	return result;
}

/** Names and addresses of the people with these ids (ids missing or null are skipped). */
export async function personRefs(ids: (string | null)[], tx: DbOrTx = db): Promise<Map<string, PersonRef>> {
	const wanted = [...new Set(ids.filter((x): x is string => !!x))];
	if (!wanted.length) return new Map();
	const rows = await tx.select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, wanted));
	return new Map(rows.map((u) => [u.id, { id: u.id, email: u.email, name: u.name ?? u.email }]));
}

export async function list(): Promise<Person[]> {
	const rows = await db.select().from(users).orderBy(asc(users.email));
	const roles = await rolesOf(
		db,
		rows.map((r) => r.id)
	);
	return rows.map((u) => toPerson(u, roles.get(u.id)));
}

/** Active people holding the role (a deactivated lead is neither offered nor mailed). */
export async function listWithRole(role: Role, tx: DbOrTx = db): Promise<Person[]> {
	const rows = await tx
		.select({ id: users.id, email: users.email, name: users.name, deactivatedAt: users.deactivatedAt })
		.from(users)
		.innerJoin(userRoles, eq(userRoles.userId, users.id))
		.where(and(eq(userRoles.role, role), isNull(users.deactivatedAt)));
	const roles = await rolesOf(
		tx,
		rows.map((r) => r.id)
	);
	return rows.map((u) => toPerson(u, roles.get(u.id)));
}

/**
 * Adds a person (or updates the name of an existing one) with roles, records it, and,
 * when `inviteUrl` is given, queues an invitation mail — all in one transaction.
 */
export async function upsert(
	input: { email: string; name: string; roles: Role[] },
	actorId: string | null,
	inviteUrl?: string
): Promise<Person> {
	const email = normaliseEmail(input.email);
	return changingAccess((p: Person) => p.id, async (tx) => {
		const [u] = await tx
			.insert(users)
			.values({ email, name: input.name })
			.onConflictDoUpdate({ target: users.email, set: { name: sql`coalesce(excluded.name, ${users.name})` } })
			.returning();
		for (const role of input.roles) {
			await tx.insert(userRoles).values({ userId: u.id, role, grantedBy: actorId }).onConflictDoNothing();
		}
		await recordAudit(tx, {
			actorId,
			action: inviteUrl ? 'person.invited' : 'person.saved',
			entity: 'person',
			entityId: u.id,
			detail: { email, roles: input.roles }
		});
		if (inviteUrl) {
			await enqueueMail(tx, {
				to: email,
				subject: 'You have been invited to Junctionary',
				text: `Hello ${input.name},\n\nYou have been given access to Junctionary, the team's catalogue of measured junctions, as ${input.roles.join(', ') || 'a member'}.\n\nSign in with this address here:\n${inviteUrl}\n\nNo password is needed: each sign-in sends a one-time link to this address.\n`,
				html: `<p>Hello ${escapeHtml(input.name)},</p><p>You have been given access to Junctionary, the team's catalogue of measured junctions, as <b>${escapeHtml(input.roles.join(', ') || 'a member')}</b>.</p><p><a href="${escapeHtml(inviteUrl)}">Sign in with this address</a></p><p>No password is needed: each sign-in sends a one-time link to this address.</p>`
			});
		}
		return toPerson(u, (await rolesOf(tx, [u.id])).get(u.id));
	});
}

/**
 * Grants or removes one role, with its audit row. Returns whether anything changed (granting
 * a role already held, or removing one not held, changes nothing and records nothing).
 */
export async function setRole(userId: string, role: Role, granted: boolean, actorId: string): Promise<boolean> {
	return changingAccess(userId, async (tx) => {
		const rows = granted
			? await tx.insert(userRoles).values({ userId, role, grantedBy: actorId }).onConflictDoNothing().returning({ role: userRoles.role })
			: await tx
					.delete(userRoles)
					.where(and(eq(userRoles.userId, userId), eq(userRoles.role, role)))
					.returning({ role: userRoles.role });
		if (rows.length === 0) return false;
		await recordAudit(tx, {
			actorId,
			action: granted ? 'role.granted' : 'role.revoked',
			entity: 'person',
			entityId: userId,
			detail: { role }
		});
		return true;
	});
}

/**
 * Switches a person off at once: every browser session is ended and every API token revoked
 * in the same transaction as the flag and its audit row, so nothing they hold keeps working.
 * Their name stays on everything they did; sign-in is refused until they are reactivated.
 */
export async function deactivate(userId: string, actorId: string): Promise<Person> {
	if (userId === actorId) throw new DomainError(400, 'You cannot deactivate yourself; ask another admin.');
	return changingAccess(userId, async (tx) => {
		const [u] = await tx
			.update(users)
			.set({ deactivatedAt: new Date() })
			.where(and(eq(users.id, userId), isNull(users.deactivatedAt)))
			.returning();
		if (!u) throw await accessRefusal(tx, userId, 'already deactivated');
		const ended = await tx.delete(sessions).where(eq(sessions.userId, userId)).returning({ token: sessions.sessionToken });
		const revoked = await tx
			.update(apiTokens)
			.set({ revokedAt: new Date() })
			.where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)))
			.returning({ id: apiTokens.id });
		await recordAudit(tx, {
			actorId,
			action: 'person.deactivated',
			entity: 'person',
			entityId: userId,
			detail: { email: u.email, sessionsEnded: ended.length, tokensRevoked: revoked.length }
		});
		return toPerson(u, (await rolesOf(tx, [u.id])).get(u.id));
	});
}

/** Lets a deactivated person sign in again (revoked tokens stay revoked: they make new ones). */
export async function reactivate(userId: string, actorId: string): Promise<Person> {
	return changingAccess(userId, async (tx) => {
		const [u] = await tx
			.update(users)
			.set({ deactivatedAt: null })
			.where(and(eq(users.id, userId), isNotNull(users.deactivatedAt)))
			.returning();
		if (!u) throw await accessRefusal(tx, userId, 'active');
		await recordAudit(tx, { actorId, action: 'person.reactivated', entity: 'person', entityId: userId, detail: { email: u.email } });
		return toPerson(u, (await rolesOf(tx, [u.id])).get(u.id));
	});
}

/** 404 for an unknown person, 409 when they are already in the state asked for. */
async function accessRefusal(tx: DbOrTx, userId: string, already: string): Promise<DomainError> {
	const person = await findById(userId, tx);
	if (!person) return new DomainError(404, 'There is no such person.');
	return new DomainError(409, `${person.name} is ${already}.`);
}

export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
