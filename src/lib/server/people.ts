import { and, asc, eq, gt, inArray, isNull, sql } from 'drizzle-orm';
import { db, type DbOrTx } from './db';
import { apiTokens, sessions, userRoles, users } from './db/schema';
import { recordAudit } from './audit';
import { enqueueMail } from './mail';
import { isRole, type Role } from '$lib/permissions';

export type Person = { id: string; email: string; name: string; roles: Role[] };
/** A person as lists and records name them. */
export type PersonRef = { id: string; name: string; email: string };

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

function toPerson(u: { id: string; email: string; name: string | null }, roles: Role[] | undefined): Person {
	return { id: u.id, email: u.email, name: u.name ?? u.email, roles: (roles ?? []).sort() };
}

/** Roles gathered in the same query as the person (one round trip per request). */
const rolesColumn = sql<Role[] | null>`(select array_agg(${userRoles.role} order by ${userRoles.role}) from ${userRoles} where ${userRoles.userId} = ${users.id})`;

const personColumns = { id: users.id, email: users.email, name: users.name, roles: rolesColumn };

export async function findByEmail(email: string, tx: DbOrTx = db): Promise<Person | null> {
	const [row] = await tx.select(personColumns).from(users).where(eq(users.email, normaliseEmail(email)));
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

export async function findById(id: string, tx: DbOrTx = db): Promise<Person | null> {
	const [row] = await tx.select(personColumns).from(users).where(eq(users.id, id));
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

/** The person behind a browser session cookie, or null when absent or expired. */
export async function findBySessionToken(token: string): Promise<Person | null> {
	const [row] = await db
		.select(personColumns)
		.from(sessions)
		.innerJoin(users, eq(users.id, sessions.userId))
		.where(and(eq(sessions.sessionToken, token), gt(sessions.expires, new Date())));
	return row ? toPerson(row, (row.roles ?? []).filter(isRole)) : null;
}

/**
 * The token lookup runs on every API request: built once and prepared (named statement),
 * so a request neither rebuilds the query nor has PostgreSQL plan it again.
 */
const byTokenHash = db
	.select({ ...personColumns, tokenId: apiTokens.id, tokenHash: apiTokens.tokenHash, lastUsedAt: apiTokens.lastUsedAt })
	.from(apiTokens)
	.innerJoin(users, eq(users.id, apiTokens.userId))
	.where(and(eq(apiTokens.tokenHash, sql.placeholder('digest')), isNull(apiTokens.revokedAt)))
	.prepare('people_by_token_hash');

/** The owner of an unrevoked API token with this SHA-256, with the token's id and last use. */
export async function findByTokenHash(digest: string) {
	const [row] = await byTokenHash.execute({ digest });
	if (!row) return null;
	return { person: toPerson(row, (row.roles ?? []).filter(isRole)), tokenId: row.tokenId, tokenHash: row.tokenHash, lastUsedAt: row.lastUsedAt };
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

export async function listWithRole(role: Role, tx: DbOrTx = db): Promise<Person[]> {
	const rows = await tx
		.select({ id: users.id, email: users.email, name: users.name })
		.from(users)
		.innerJoin(userRoles, eq(userRoles.userId, users.id))
		.where(eq(userRoles.role, role));
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
	return db.transaction(async (tx) => {
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

export async function setRole(userId: string, role: Role, granted: boolean, actorId: string) {
	await db.transaction(async (tx) => {
		if (granted) {
			await tx.insert(userRoles).values({ userId, role, grantedBy: actorId }).onConflictDoNothing();
		} else {
			await tx.delete(userRoles).where(and(eq(userRoles.userId, userId), eq(userRoles.role, role)));
		}
		await recordAudit(tx, {
			actorId,
			action: granted ? 'role.granted' : 'role.revoked',
			entity: 'person',
			entityId: userId,
			detail: { role }
		});
	});
}

export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
}
