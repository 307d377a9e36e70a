import { fail } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import * as tokens from '$lib/server/tokens';
import { fieldErrors, tokenForm } from '$lib/schemas/people';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'tokens:own');
	return { tokens: await tokens.listFor(user.id) };
};

export const actions: Actions = {
	create: async (event) => {
		const user = requirePermission(event, 'tokens:own');
		const values = { name: String((await event.request.formData()).get('name') ?? '') };
		const parsed = tokenForm.safeParse(values);
		if (!parsed.success) return fail(400, { values, errors: fieldErrors(parsed.error) });
		const created = await tokens.create(user.id, parsed.data.name);
		// Shown once in this response; only its hash is stored.
		return { created: { name: created.name, token: created.token } };
	},
	revoke: async (event) => {
		const user = requirePermission(event, 'tokens:own');
		const id = Number((await event.request.formData()).get('id'));
		if (!Number.isInteger(id) || !(await tokens.revoke(user.id, id))) return fail(404, { revokeError: 'No such active token.' });
		return { revoked: true };
	}
};
