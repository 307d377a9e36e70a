/**
 * Reading the audit log for the admin's audit page: newest first, filtered by the person
 * who acted, the action and a date range, a page at a time.
 */
import { and, count, desc, eq, gte, inArray, lt, sql, type SQL } from 'drizzle-orm';
import { db } from './db';
import { auditLog, users } from './db/schema';

const AUDIT_PAGE_SIZE = 50;

export type AuditFilter = {
	actorId?: string;
	action?: string;
	/** Entries at or after this instant. */
	from?: Date;
	/** Entries before this instant. */
	until?: Date;
	/** 1-based page number. */
	page: number;
};

export type AuditEntry = {
	id: number;
	at: Date;
	actor: { id: string; name: string; email: string } | null;
	action: string;
	entity: string;
	entityId: string;
	detail: Record<string, unknown>;
	/** For entries about a person: their name. */
	subject: string | null;
};

export async function search(filter: AuditFilter): Promise<{ entries: AuditEntry[]; total: number; pages: number }> {
	const where: SQL[] = [];
	if (filter.actorId) where.push(eq(auditLog.actorId, filter.actorId));
	if (filter.action) where.push(eq(auditLog.action, filter.action));
	if (filter.from) where.push(gte(auditLog.at, filter.from));
	if (filter.until) where.push(lt(auditLog.at, filter.until));
	const cond = where.length ? and(...where) : undefined;
	const [{ n }] = await db.select({ n: count() }).from(auditLog).where(cond);
	const pages = Math.max(1, Math.ceil(n / AUDIT_PAGE_SIZE));
	const page = Math.min(Math.max(1, filter.page), pages);
	const rows = await db
		.select({
			id: auditLog.id,
			at: auditLog.at,
			action: auditLog.action,
			entity: auditLog.entity,
			entityId: auditLog.entityId,
			detail: auditLog.detail,
			actorId: auditLog.actorId,
			actorName: users.name,
			actorEmail: users.email
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.actorId))
		.where(cond)
		.orderBy(desc(auditLog.at), desc(auditLog.id))
		.limit(AUDIT_PAGE_SIZE)
		.offset((page - 1) * AUDIT_PAGE_SIZE);
	const personIds = [...new Set(rows.filter((r) => r.entity === 'person').map((r) => r.entityId))];
	const subjects = personIds.length
		? new Map((await db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, personIds))).map((u) => [u.id, u.name ?? u.email]))
		: new Map<string, string>();
	return {
		total: n,
		pages,
		entries: rows.map((r) => ({
			id: r.id,
			at: r.at,
			actor: r.actorId && r.actorEmail ? { id: r.actorId, name: r.actorName ?? r.actorEmail, email: r.actorEmail } : null,
			action: r.action,
			entity: r.entity,
			entityId: r.entityId,
			detail: r.detail,
			subject: r.entity === 'person' ? (subjects.get(r.entityId) ?? null) : null
		}))
	};
}

/** Every action recorded so far, for the filter list. */
export async function actions(): Promise<string[]> {
	const rows = await db.selectDistinct({ action: auditLog.action }).from(auditLog).orderBy(sql`1`);
	return rows.map((r) => r.action);
}
