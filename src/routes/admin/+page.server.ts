import { fail, type RequestEvent } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { formFailure } from '$lib/server/errors';
import * as people from '$lib/server/people';
import { fieldErrors, inviteForm, personForm, roleChangeForm } from '$lib/schemas/people';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'people:manage');
	return { people: await people.list(), me: user.id };
};

const gone = () => fail(404, { changeError: 'That person is not on the list any more; reload the page.' });

/** Deactivating or reactivating a person: asked for first, then (confirm=1) done and said. */
function access(kind: 'deactivate' | 'reactivate', done: (name: string) => string) {
	return async (event: RequestEvent) => {
		const actor = requirePermission(event, 'people:manage');
		const parsed = personForm.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { changeError: 'Which person? Reload the page and try again.' });
		const person = await people.findById(parsed.data.userId);
		if (!person) return gone();
		if (kind === 'deactivate' && person.id === actor.id) return fail(400, { changeError: 'You cannot deactivate yourself; ask another admin.' });
		if (!parsed.data.confirm) return { confirm: { kind, userId: person.id, name: person.name } };
		try {
			await (kind === 'deactivate' ? people.deactivate : people.reactivate)(person.id, actor.id);
		} catch (e) {
			return formFailure(e, (d) => ({ changeError: d.message }));
		}
		return { done: done(person.name), doneFor: person.id };
	};
}

export const actions: Actions = {
	invite: async (event) => {
		const actor = requirePermission(event, 'people:manage');
		const fd = await event.request.formData();
		const values = { email: String(fd.get('email') ?? ''), name: String(fd.get('name') ?? ''), roles: fd.getAll('roles').map(String) };
		const parsed = inviteForm.safeParse(values);
		if (!parsed.success) return fail(400, { invite: { values, errors: fieldErrors(parsed.error) } });
		const person = await people.upsert(parsed.data, actor.id, `${event.url.origin}/signin`);
		return { invited: person.email };
	},
	// Each change is asked for, then confirmed: the first post returns the question, the second (confirm=1) acts.
	role: async (event) => {
		const actor = requirePermission(event, 'people:manage');
		const parsed = roleChangeForm.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { changeError: 'That role change was not understood; reload the page and try again.' });
		const { userId, role, grant, confirm } = parsed.data;
		if (!grant && role === 'admin' && userId === actor.id) {
			return fail(400, { changeError: 'You cannot remove your own admin role; ask another admin.' });
		}
		const person = await people.findById(userId);
		if (!person) return gone();
		if (!confirm) return { confirm: { kind: 'role' as const, userId, role, grant, name: person.name } };
		const changed = await people.setRole(userId, role, grant, actor.id);
		const done = grant
			? changed
				? `${person.name} now holds the ${role} role.`
				: `${person.name} already held the ${role} role; nothing changed.`
			: changed
				? `${person.name} no longer holds the ${role} role.`
				: `${person.name} did not hold the ${role} role; nothing changed.`;
		return { done, doneFor: userId };
	},
	deactivate: access('deactivate', (name) => `${name} is deactivated: signed out everywhere, every API token revoked. Their work stays on record.`),
	reactivate: access('reactivate', (name) => `${name} can sign in again. Their old API tokens stay revoked; they can make new ones.`)
};
