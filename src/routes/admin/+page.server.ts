import { fail } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import * as people from '$lib/server/people';
import { fieldErrors, inviteForm, roleChangeForm } from '$lib/schemas/people';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'people:manage');
	return { people: await people.list() };
};

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
	role: async (event) => {
		const actor = requirePermission(event, 'people:manage');
		const parsed = roleChangeForm.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { roleError: 'That role change was not understood.' });
		const { userId, role, grant } = parsed.data;
		if (!grant && role === 'admin' && userId === actor.id) {
			return fail(400, { roleError: 'You cannot remove your own admin role; ask another admin.' });
		}
		await people.setRole(userId, role, grant, actor.id);
		return { changed: true };
	}
};
