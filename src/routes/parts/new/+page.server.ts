import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { DomainError } from '$lib/server/api';
import * as catalogue from '$lib/server/catalogue';
import { partFormErrors, partFromForm, partInput } from '$lib/schemas/catalogue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requirePermission(event, 'catalogue:write');
	return {};
};

export const actions: Actions = {
	default: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const { values, candidate } = partFromForm(await event.request.formData());
		const parsed = partInput.safeParse(candidate);
		if (!parsed.success) return fail(400, { values, errors: partFormErrors(parsed.error) });
		let id: number;
		try {
			id = (await catalogue.create(user, parsed.data)).id;
		} catch (e) {
			if (e instanceof DomainError) return fail(e.status, { values, errors: { [e.issues?.[0]?.path ?? 'form']: e.message } });
			throw e;
		}
		redirect(303, `/parts/${id}`);
	}
};
