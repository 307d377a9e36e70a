/**
 * Changing a project's people: removing a member and naming another lead (or any lead),
 * also while a review is open. Each change is one transaction holding the project row
 * locked (two changes at once cannot together leave an open review with nobody to decide),
 * with its audit row and a mail to the person removed or named.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import { checkLead, checkRemoval, type Person as Decider } from '$lib/project-people';
import { STATE_LABEL, isReviewState } from '$lib/review-transitions';
import { db, type DbOrTx } from './db';
import { projectMembers, projects, reviewEvents } from './db/schema';
import { DomainError } from './errors';
import { recordAudit } from './audit';
import { enqueueMail, type Mail } from './mail';
import * as people from './people';
import { escapeHtml } from './people';

type Project = typeof projects.$inferSelect;
type Actor = { id: string; name: string };

/** The project, locked for the rest of the transaction. */
async function lockProject(tx: DbOrTx, projectId: number): Promise<Project> {
	const [p] = await tx.select().from(projects).where(eq(projects.id, projectId)).for('update');
	if (!p) throw new DomainError(404, `There is no project ${projectId}.`);
	return p;
}

/** Who sent the current round for review (the latest submission), if any. */
async function submitter(tx: DbOrTx, projectId: number): Promise<string | null> {
	const [e] = await tx
		.select({ actorId: reviewEvents.actorId })
		.from(reviewEvents)
		.where(and(eq(reviewEvents.projectId, projectId), eq(reviewEvents.action, 'submit')))
		.orderBy(desc(reviewEvents.at), desc(reviewEvents.id))
		.limit(1);
	return e?.actorId ?? null;
}

const stateWords = (s: string) => (isReviewState(s) ? STATE_LABEL[s].toLowerCase() : s);

function mail(to: { email: string; name: string }, subject: string, lines: string[], link: string): Mail {
	const text = [`Hello ${to.name},`, '', ...lines, '', `Open the project: ${link}`].join('\n');
	const html = `<p>Hello ${escapeHtml(to.name)},</p>${lines.map((l) => `<p>${escapeHtml(l)}</p>`).join('')}<p><a href="${escapeHtml(link)}">Open the project</a></p>`;
	return { to: to.email, subject, text, html };
}

const projectLink = (origin: string, id: number) => `${origin.replace(/\/$/, '')}/projects/${id}`;

/** The person behind an address, or a 422 naming the field. */
async function personByEmail(email: string, tx: DbOrTx, path = 'email'): Promise<people.Person> {
	const p = await people.findByEmail(email, tx);
	if (!p) throw new DomainError(422, `No person with the address ${email}.`, [{ path, message: `No person with the address ${email}.` }]);
	return p;
}

/**
 * Removes a member. A named lead who leaves takes the lead with them (any lead decides);
 * an open review keeps someone who can decide, or the removal is refused (409).
 */
export async function removeMember(projectId: number, email: string, actor: Actor, origin: string) {
	return db.transaction(async (tx) => {
		const project = await lockProject(tx, projectId);
		const person = await personByEmail(email, tx);
		const gone = await tx
			.delete(projectMembers)
			.where(and(eq(projectMembers.projectId, projectId), eq(projectMembers.userId, person.id)))
			.returning();
		if (gone.length === 0) throw new DomainError(404, `${person.name} is not a member of this project.`, [{ path: 'email', message: 'Not a member.' }]);
		// Refused after the delete: the transaction then rolls it back.
		const leads: Decider[] = await people.listWithRole('lead', tx);
		const check = checkRemoval(project.state, person, project, await submitter(tx, projectId), leads);
		if (!check.ok) throw new DomainError(check.status, check.reason, [{ path: 'email', message: check.reason }]);
		const wasLead = project.leadId === person.id;
		if (wasLead) await tx.update(projects).set({ leadId: null, version: sql`${projects.version} + 1` }).where(eq(projects.id, projectId));
		await recordAudit(tx, { actorId: actor.id, action: 'project.member-removed', entity: 'project', entityId: projectId, detail: { email: person.email, name: person.name, wasLead } });
		if (person.id !== actor.id)
			await enqueueMail(
				tx,
				mail(person, `You are no longer on the project “${project.name}”`, [
					`${actor.name} has removed you from the project “${project.name}” (now ${stateWords(project.state)}).`,
					wasLead ? 'You were its named lead; any lead now decides on its shortlist.' : 'You will no longer hear of its review.'
				], projectLink(origin, projectId))
			);
		return { removed: person.email, wasLead };
	});
}

/**
 * Names `leadEmail` (null: any lead) to decide the project's shortlist, also while the
 * review is open; the version is bumped, so a decision already under way is refused as
 * stale. The new lead joins the members. Mails go to the newly named and the former lead.
 */
export async function changeLead(projectId: number, leadEmail: string | null, actor: Actor, origin: string) {
	return db.transaction(async (tx) => {
		const project = await lockProject(tx, projectId);
		const lead = leadEmail ? await personByEmail(leadEmail, tx, 'leadEmail') : null;
		if (lead && !lead.roles.includes('lead'))
			throw new DomainError(422, `${lead.name} does not hold the lead role.`, [{ path: 'leadEmail', message: `${lead.email} is not a lead.` }]);
		if (lead?.deactivatedAt)
			throw new DomainError(422, `${lead.name} is deactivated and cannot decide.`, [{ path: 'leadEmail', message: `${lead.name} is deactivated; choose another lead.` }]);
		if ((lead?.id ?? null) === project.leadId)
			throw new DomainError(409, lead ? `${lead.name} already decides this project.` : 'Any lead already decides this project.', [{ path: 'leadEmail', message: 'No change.' }]);
		const check = checkLead(project.state, lead?.id ?? null, await submitter(tx, projectId), await people.listWithRole('lead', tx));
		if (!check.ok) throw new DomainError(check.status, check.reason, [{ path: 'leadEmail', message: check.reason }]);
		const [updated] = await tx
			.update(projects)
			.set({ leadId: lead?.id ?? null, version: sql`${projects.version} + 1` })
			.where(eq(projects.id, projectId))
			.returning({ version: projects.version });
		if (lead) await tx.insert(projectMembers).values({ projectId, userId: lead.id }).onConflictDoNothing();
		const former = project.leadId ? await people.findById(project.leadId, tx) : null;
		await recordAudit(tx, {
			actorId: actor.id,
			action: 'project.lead-changed',
			entity: 'project',
			entityId: projectId,
			detail: { from: former?.email ?? null, to: lead?.email ?? null, toName: lead?.name ?? null }
		});
		const link = projectLink(origin, projectId);
		const who = lead ? lead.name : 'any lead';
		if (lead && lead.id !== actor.id)
			await enqueueMail(
				tx,
				mail(lead, `You now decide on the shortlist of “${project.name}”`, [
					`${actor.name} has named you the lead of “${project.name}”.`,
					project.state === 'in-review' ? 'The shortlist awaits your decision.' : `The shortlist is ${stateWords(project.state)}; you will hear when it is sent for review.`
				], link)
			);
		if (former && former.id !== actor.id && former.id !== lead?.id)
			await enqueueMail(tx, mail(former, `“${project.name}” is now decided by ${who}`, [`${actor.name} has handed the decision on “${project.name}” from you to ${who}.`], link));
		return { leadId: lead?.id ?? null, version: updated.version };
	});
}
