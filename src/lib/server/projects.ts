/**
 * Projects: a saved requirement, its members and lead, and a shortlist of parts, each
 * re-evaluated live against the requirement. Review transitions live in review.ts.
 */
import { and, asc, desc, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { db, type DbOrTx } from './db';
import { auditLog, parts, projectMembers, projects, reviewEvents, shortlistEntries, users, type Requirement } from './db/schema';
import { DomainError } from './errors';
import { recordAudit } from './audit';
import * as people from './people';
import { personRefs } from './people';
import { predictEntries, type ModelRecord, type PartModels } from './project-predictions';
import { verdict, type Entry, type PersonRef, type Prediction, type Verdict } from '$lib/projects/shortlist';
import { EDITABLE_STATES, isEditable, STATE_LABEL, isReviewState } from '$lib/review-transitions';
import type { CreateProjectInput } from '$lib/schemas/projects';
import { auditWords } from '$lib/audit-words';
import type { NodeRequirement } from '$lib/schemas/node';

export type { Prediction, Entry, PersonRef, Verdict };
export { verdict };

export type Project = typeof projects.$inferSelect;

async function resolvePeople(input: CreateProjectInput, tx: DbOrTx) {
	let lead: people.Person | null = null;
	if (input.leadEmail) {
		lead = await people.findByEmail(input.leadEmail, tx);
		if (!lead) throw new DomainError(400, 'The lead is not known here.', [{ path: 'leadEmail', message: `No person with the address ${input.leadEmail}.` }]);
		if (lead.deactivatedAt)
			throw new DomainError(400, 'The named lead is deactivated.', [{ path: 'leadEmail', message: `${lead.name} is deactivated; choose another lead.` }]);
		if (!lead.roles.includes('lead'))
			throw new DomainError(400, 'The named lead does not hold the lead role.', [{ path: 'leadEmail', message: `${input.leadEmail} is not a lead.` }]);
	}
	const members: people.Person[] = [];
	for (const [i, e] of input.memberEmails.entries()) {
		const p = await people.findByEmail(e, tx);
		if (!p) throw new DomainError(400, 'A member is not known here.', [{ path: `memberEmails.${i}`, message: `No person with the address ${e}.` }]);
		members.push(p);
	}
	return { lead, members };
}

export async function create(input: CreateProjectInput, actorId: string): Promise<Project> {
	return db.transaction(async (tx) => {
		const { lead, members } = await resolvePeople(input, tx);
		const [project] = await tx
			.insert(projects)
			.values({ name: input.name, description: input.description, requirement: input.requirement, leadId: lead?.id ?? null, createdBy: actorId })
			.returning();
		const memberIds = [...new Set([actorId, ...members.map((m) => m.id)])];
		await tx.insert(projectMembers).values(memberIds.map((userId) => ({ projectId: project.id, userId })));
		await recordAudit(tx, {
			actorId,
			action: 'project.created',
			entity: 'project',
			entityId: project.id,
			detail: { name: input.name, requirement: input.requirement, leadEmail: lead?.email ?? null, members: memberIds.length }
		});
		return project;
	});
}

export type ProjectSummary = Project & { lead: PersonRef | null; entryCount: number };

/** Projects, newest first; `memberId` keeps those the person belongs to, `open` those whose shortlist may change. */
export async function list(filter: { state?: string; memberId?: string; open?: boolean } = {}): Promise<ProjectSummary[]> {
	const conditions: SQL[] = [];
	if (filter.state && isReviewState(filter.state)) conditions.push(eq(projects.state, filter.state));
	if (filter.open) conditions.push(inArray(projects.state, [...EDITABLE_STATES]));
	if (filter.memberId)
		conditions.push(sql`exists (select 1 from ${projectMembers} where ${projectMembers.projectId} = ${projects.id} and ${projectMembers.userId} = ${filter.memberId})`);
	const rows = await db
		.select()
		.from(projects)
		.where(conditions.length ? and(...conditions) : undefined).orderBy(desc(projects.updatedAt), desc(projects.id)).limit(500);
	const ids = rows.map((r) => r.id);
	const counts = ids.length
		? await db
				.select({ projectId: shortlistEntries.projectId, n: sql<number>`count(*)::int` })
				.from(shortlistEntries)
				.where(inArray(shortlistEntries.projectId, ids))
				.groupBy(shortlistEntries.projectId)
		: [];
	const countOf = new Map(counts.map((c) => [c.projectId, c.n]));
	const refs = await personRefs(rows.map((r) => r.leadId));
	return rows.map((p) => ({ ...p, lead: p.leadId ? (refs.get(p.leadId) ?? null) : null, entryCount: countOf.get(p.id) ?? 0 }));
}

export async function find(id: number, tx: DbOrTx = db): Promise<Project> {
	const [p] = await tx.select().from(projects).where(eq(projects.id, id));
	if (!p) throw new DomainError(404, `There is no project ${id}.`);
	return p;
}

export async function members(projectId: number, tx: DbOrTx = db): Promise<PersonRef[]> {
	const rows = await tx
		.select({ id: users.id, name: users.name, email: users.email })
		.from(projectMembers)
		.innerJoin(users, eq(users.id, projectMembers.userId))
		.where(eq(projectMembers.projectId, projectId))
		.orderBy(asc(projectMembers.addedAt));
	return rows.map((u) => ({ id: u.id, email: u.email, name: u.name ?? u.email }));
}

/** Shortlist rows with part facts (no predictions). */
export async function entryRows(projectId: number, tx: DbOrTx = db) {
	return tx
		.select({
			id: shortlistEntries.id,
			partId: shortlistEntries.partId,
			note: shortlistEntries.note,
			addedBy: shortlistEntries.addedBy,
			addedAt: shortlistEntries.addedAt,
			partNumber: parts.partNumber,
			maker: parts.maker,
			kind: parts.kind,
			modelVersion: parts.modelVersion
		})
		.from(shortlistEntries)
		.innerJoin(parts, eq(parts.id, shortlistEntries.partId))
		.where(eq(shortlistEntries.projectId, projectId))
		.orderBy(asc(shortlistEntries.addedAt), asc(shortlistEntries.id));
}

/** The shortlist, each entry predicted now at the project's requirement. */
export async function entries(project: Project): Promise<Entry[]> {
	return (await evaluate(project)).entries;
}

/** Entries with predictions, and the models they came from (typical, and every sample's; one cache snapshot). */
export async function evaluate(
	project: Project
): Promise<{ entries: Entry[]; models: Map<number, ModelRecord>; parts: Map<number, PartModels> }> {
	const rows = await entryRows(project.id);
	const { predictions, models, parts, nodes } = await predictEntries(
		rows.map((r) => r.partId),
		project.requirement
	);
	const refs = await personRefs(rows.map((r) => r.addedBy));
	const list = rows.map((r) => {
		const prediction = predictions.get(r.partId) ?? null;
		const node = nodes.get(r.partId) ?? null;
		return {
			id: r.id,
			partId: r.partId,
			partNumber: r.partNumber,
			maker: r.maker,
			kind: r.kind,
			note: r.note,
			addedBy: r.addedBy ? (refs.get(r.addedBy) ?? null) : null,
			addedAt: r.addedAt,
			prediction,
			node,
			verdict: prediction ? verdict(prediction, project.requirement, node) : null
		};
	});
	return { entries: list, models, parts };
}

/**
 * Bumps the project's version inside `tx`, but only while the shortlist may change;
 * otherwise 404 or 409 saying why. Serialises shortlist edits against transitions.
 */
async function lockForEdit(tx: DbOrTx, projectId: number): Promise<Project> {
	const [p] = await tx
		.update(projects)
		.set({ version: sql`${projects.version} + 1` })
		.where(and(eq(projects.id, projectId), inArray(projects.state, [...EDITABLE_STATES])))
		.returning();
	if (p) return p;
	const current = await find(projectId, tx);
	const label = isReviewState(current.state) ? STATE_LABEL[current.state].toLowerCase() : current.state;
	throw new DomainError(409, `The shortlist cannot change while the project is ${label}.`);
}

/**
 * Puts a protected node into the project's requirement (null takes it out), while the
 * shortlist may change: the shortlist is then judged in it, and review snapshots keep it.
 * Parts named in fixed positions must be in the catalogue.
 */
export async function setNode(projectId: number, node: NodeRequirement | null, actorId: string): Promise<Project> {
	return db.transaction(async (tx) => {
		const current = await lockForEdit(tx, projectId);
		const fixed = [...new Set((node?.junctions ?? []).flatMap((j) => (j.id !== undefined ? [j.id] : [])))];
		if (fixed.length) {
			const found = new Set((await tx.select({ id: parts.id }).from(parts).where(inArray(parts.id, fixed))).map((r) => r.id));
			const i = node!.junctions.findIndex((j) => j.id !== undefined && !found.has(j.id));
			if (i >= 0) throw new DomainError(422, `There is no part ${node!.junctions[i].id} in the catalogue.`, [{ path: `junctions.${i}.id`, message: 'No such part.' }]);
		}
		const { node: _previous, ...rest } = current.requirement;
		const requirement: Requirement = node ? { ...rest, node } : rest;
		const [updated] = await tx.update(projects).set({ requirement }).where(eq(projects.id, projectId)).returning();
		await recordAudit(tx, {
			actorId,
			action: node ? 'project.node-set' : 'project.node-removed',
			entity: 'project',
			entityId: projectId,
			detail: node ? { node } : {}
		});
		return updated;
	});
}

export async function addEntry(projectId: number, input: { junctionId: number; note: string }, actorId: string) {
	return db.transaction(async (tx) => {
		await lockForEdit(tx, projectId);
		const [part] = await tx.select({ id: parts.id, partNumber: parts.partNumber }).from(parts).where(eq(parts.id, input.junctionId));
		if (!part) throw new DomainError(422, `There is no part ${input.junctionId} in the catalogue.`, [{ path: 'junctionId', message: 'No such part.' }]);
		const [entry] = await tx
			.insert(shortlistEntries)
			.values({ projectId, partId: part.id, note: input.note, addedBy: actorId })
			.onConflictDoNothing()
			.returning();
		if (!entry) throw new DomainError(409, `${part.partNumber} is already on this shortlist.`, [{ path: 'junctionId', message: 'Already listed.' }]);
		await recordAudit(tx, {
			actorId,
			action: 'shortlist.added',
			entity: 'project',
			entityId: projectId,
			detail: { partId: part.id, partNumber: part.partNumber, note: input.note }
		});
		return entry;
	});
}

/** Finds a part by its number (any case); several makers of one number must be told apart. */
export async function partByNumber(text: string): Promise<{ id: number; partNumber: string; maker: string }> {
	const q = text.trim();
	const rows = await db
		.select({ id: parts.id, partNumber: parts.partNumber, maker: parts.maker })
		.from(parts)
		.where(sql`lower(${parts.partNumber}) = lower(${q}) or lower(${parts.maker} || ' ' || ${parts.partNumber}) = lower(${q})`)
		.limit(10);
	if (rows.length === 0) throw new DomainError(422, `No part numbered “${q}” in the catalogue.`, [{ path: 'partNumber', message: `No part numbered “${q}”.` }]);
	if (rows.length > 1) {
		const makers = rows.map((r) => `${r.maker} ${r.partNumber}`).join(', ');
		throw new DomainError(422, `Several makers use that number: ${makers}.`, [{ path: 'partNumber', message: `Several makers use that number; write the maker first, e.g. “${rows[0].maker} ${rows[0].partNumber}”.` }]);
	}
	return rows[0];
}

export async function removeEntry(projectId: number, partId: number, actorId: string) {
	await db.transaction(async (tx) => {
		await lockForEdit(tx, projectId);
		const [gone] = await tx
			.delete(shortlistEntries)
			.where(and(eq(shortlistEntries.projectId, projectId), eq(shortlistEntries.partId, partId)))
			.returning();
		if (!gone) throw new DomainError(404, `Part ${partId} is not on this shortlist.`);
		const [part] = await tx.select({ partNumber: parts.partNumber }).from(parts).where(eq(parts.id, partId));
		await recordAudit(tx, {
			actorId,
			action: 'shortlist.removed',
			entity: 'project',
			entityId: projectId,
			detail: { partId, partNumber: part?.partNumber ?? null }
		});
	});
}

export async function addMember(projectId: number, email: string, actorId: string): Promise<PersonRef> {
	return db.transaction(async (tx) => {
		await find(projectId, tx);
		const person = await people.findByEmail(email, tx);
		if (!person) throw new DomainError(422, `No person with the address ${email}.`, [{ path: 'email', message: `No person with the address ${email}.` }]);
		const [row] = await tx.insert(projectMembers).values({ projectId, userId: person.id }).onConflictDoNothing().returning();
		if (!row) throw new DomainError(409, `${person.name} is already a member.`, [{ path: 'email', message: 'Already a member.' }]);
		await recordAudit(tx, { actorId, action: 'project.member-added', entity: 'project', entityId: projectId, detail: { email: person.email } });
		return { id: person.id, name: person.name, email: person.email };
	});
}

export type ActivityItem = {
	at: Date;
	who: string;
	what: string;
	comment?: string;
	kind: 'review' | 'change';
};

/** Who did what, newest first: shortlist and membership changes, and every review step. */
export async function activity(projectId: number): Promise<ActivityItem[]> {
	const audits = await db
		.select()
		.from(auditLog)
		.where(and(eq(auditLog.entity, 'project'), eq(auditLog.entityId, String(projectId))))
		.orderBy(desc(auditLog.at))
		.limit(300);
	const events = await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, projectId)).orderBy(desc(reviewEvents.at));
	const refs = await personRefs([...audits.map((a) => a.actorId), ...events.map((e) => e.actorId)]);
	const name = (id: string | null) => (id ? (refs.get(id)?.name ?? 'someone') : 'someone (since removed)');
	const items: ActivityItem[] = [];
	for (const a of audits) {
		if (a.action.startsWith('review.')) continue; // told by the review events, with their comments
		items.push({ at: a.at, who: name(a.actorId), what: auditWords(a), kind: 'change' });
	}
	for (const e of events) {
		// The same words as the audit log; the comment is shown beside them.
		const what = auditWords({ action: `review.${e.action}`, entity: 'project', entityId: String(projectId), detail: {} });
		items.push({ at: e.at, who: name(e.actorId), what, comment: e.comment || undefined, kind: 'review' });
	}
	return items.sort((a, b) => b.at.getTime() - a.at.getTime());
}

export { isEditable };
