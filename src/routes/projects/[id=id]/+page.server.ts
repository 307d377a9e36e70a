import { fail } from '@sveltejs/kit';
import type { ZodError } from 'zod';
import { can } from '$lib/permissions';
import { formFailure, pageError } from '$lib/server/errors';
import { requirePermission, requireRole } from '$lib/server/guards';
import * as projects from '$lib/server/projects';
import * as review from '$lib/server/review';
import * as people from '$lib/server/people';
import * as projectPeople from '$lib/server/project-people';
import { projectPatchSchema } from '$lib/schemas/project-people';
import { reviewSchema, shortlistAddFormSchema, shortlistRemoveFormSchema } from '$lib/schemas/projects';
import { email } from '$lib/schemas/people';
import { availableActions, isEditable } from '$lib/review-transitions';
import { queryFromOperatingPoint } from '$lib/rank/operating-point-url';
import { toOperatingPoint } from '$lib/server/project-predictions';
import { shortfalls } from '$lib/projects/shortlist';
import { nodeScreenHref } from '$lib/server/node';
import type { RequestEvent } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

/** The ranking screen at this requirement, written by the ranking's own URL module (short, exact numbers). */
function rankLink(r: projects.Project['requirement']): string {
	const { includeOverRating: _all, ...op } = toOperatingPoint(r);
	void _all;
	return `/rank?${queryFromOperatingPoint(op)}`;
}

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'project:read');
	const project = await projects.find(Number(event.params.id)).catch(pageError);
	const [entries, members, events, activity] = await Promise.all([
		projects.entries(project),
		projects.members(project.id),
		review.events(project.id),
		projects.activity(project.id)
	]);
	const resource = review.resourceOf(project, events);
	const decision = review.latestDecision(events);
	const leadRef = project.leadId ? await people.findById(project.leadId) : null;
	const canPeople = can(user, 'project:people');
	const leads = canPeople ? (await people.listWithRole('lead')).map((l) => ({ email: l.email, name: l.name })) : [];
	return {
		project,
		entries,
		members,
		lead: leadRef ? { name: leadRef.name, email: leadRef.email } : null,
		events: events.map((e) => ({ id: e.id, action: e.action, toState: e.toState, comment: e.comment, at: e.at, by: e.actorName, version: e.projectVersion })),
		decision: decision ? { action: decision.action, at: decision.at, by: decision.actorName, toState: decision.toState } : null,
		changed: decision ? review.changedSince(decision.snapshot, entries) : [],
		activity,
		actions: availableActions(user, project.state, resource),
		canEdit: can(user, 'shortlist:edit') && isEditable(project.state),
		canPeople,
		leads,
		shortfalls: shortfalls(entries),
		rankHref: rankLink(project.requirement),
		nodeHref: project.requirement.node ? await nodeScreenHref(project.requirement.node) : null
	};
};

/** A refusal by the domain (a DomainError), shown beside the form it came from. */
function problem(e: unknown, form: string, values: Record<string, string>) {
	return formFailure(e, (d) => ({ form, values, error: d.issues?.[0]?.message ?? d.message, message: d.message }));
}

/** A form that did not parse: its first problem beside it, the typed values kept. */
function refused(form: string, values: Record<string, string>, e: ZodError) {
	return fail(400, { form, values, error: e.issues[0]?.message ?? 'Check the form.', message: '' });
}

const id = (event: RequestEvent) => Number(event.params.id);

/** A form naming one person by address (adding or removing a member): parse, act, say what happened. */
function byEmail(form: string, act: (event: RequestEvent, user: App.User, address: string) => Promise<unknown>, done: (address: string) => string) {
	return async (event: RequestEvent) => {
		const user = requirePermission(event, 'project:people');
		const values = { email: String((await event.request.formData()).get('email') ?? '') };
		const parsed = email.safeParse(values.email);
		if (!parsed.success) return refused(form, values, parsed.error);
		try {
			await act(event, user, parsed.data);
			return { form, done: done(parsed.data) };
		} catch (e) {
			return problem(e, form, values);
		}
	};
}

export const actions: Actions = {
	add: async (event) => {
		const user = requirePermission(event, 'shortlist:edit');
		const fd = await event.request.formData();
		const values = { partNumber: String(fd.get('partNumber') ?? ''), note: String(fd.get('note') ?? '') };
		const parsed = shortlistAddFormSchema.safeParse(values);
		if (!parsed.success) return refused('add', values, parsed.error);
		try {
			const part = await projects.partByNumber(parsed.data.partNumber);
			await projects.addEntry(id(event), { junctionId: part.id, note: parsed.data.note }, user.id);
			// Told back as the catalogue writes it, not as it was typed.
			return { form: 'add', done: `${part.partNumber} (${part.maker}) added to the shortlist.` };
		} catch (e) {
			return problem(e, 'add', values);
		}
	},
	remove: async (event) => {
		const user = requirePermission(event, 'shortlist:edit');
		const parsed = shortlistRemoveFormSchema.safeParse({ partId: (await event.request.formData()).get('partId') ?? '' });
		if (!parsed.success) return refused('remove', {}, parsed.error);
		try {
			await projects.removeEntry(id(event), parsed.data.partId, user.id);
			return { form: 'remove', done: 'Removed from the shortlist.' };
		} catch (e) {
			return problem(e, 'remove', {});
		}
	},
	member: byEmail('member', (event, user, address) => projects.addMember(id(event), address, user.id), (a) => `${a} is now a member.`),
	removeMember: byEmail(
		'people',
		(event, user, address) => projectPeople.removeMember(id(event), address, user, process.env.ORIGIN ?? event.url.origin),
		(a) => `${a} is no longer a member.`
	),
	lead: async (event) => {
		const user = requirePermission(event, 'project:people');
		const values = { leadEmail: String((await event.request.formData()).get('leadEmail') ?? '') };
		const parsed = projectPatchSchema.safeParse(values);
		if (!parsed.success) return refused('lead', values, parsed.error);
		try {
			await projectPeople.changeLead(id(event), parsed.data.leadEmail, user, process.env.ORIGIN ?? event.url.origin);
			return { form: 'lead', done: parsed.data.leadEmail ? `${parsed.data.leadEmail} now decides.` : 'Any lead now decides.' };
		} catch (e) {
			return problem(e, 'lead', values);
		}
	},
	review: async (event) => {
		requirePermission(event, 'project:read');
		const user = requireRole(event, 'designer', 'lead');
		const fd = await event.request.formData();
		const values = { action: String(fd.get('action') ?? ''), comment: String(fd.get('comment') ?? '') };
		const parsed = reviewSchema.safeParse({ ...values, expectedVersion: Number(fd.get('version')) || undefined });
		if (!parsed.success) return refused('review', values, parsed.error);
		try {
			await review.transition(id(event), parsed.data, user, process.env.ORIGIN ?? event.url.origin);
			return { form: 'review', done: 'Recorded.' };
		} catch (e) {
			return problem(e, 'review', values);
		}
	}
};
