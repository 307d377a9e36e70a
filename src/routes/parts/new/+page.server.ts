import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { DomainError, formFailure } from '$lib/server/errors';
import * as catalogue from '$lib/server/catalogue';
import { cardTextFrom } from '$lib/catalogue/model-card';
import { DEFAULT_MATERIAL, MATERIALS, type JunctionKind, type Material } from '$lib/catalogue/vocabulary';
import { partFormErrors, partFromForm, partInput } from '$lib/schemas/catalogue';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requirePermission(event, 'catalogue:write');
	return {};
};

/** The material the part will have: as chosen, or the usual one for its kind. */
function materialOf(candidate: { material?: string; kind: string }): Material {
	if (candidate.material && (MATERIALS as readonly string[]).includes(candidate.material)) return candidate.material as Material;
	return DEFAULT_MATERIAL[candidate.kind as JunctionKind] ?? 'silicon';
}

export const actions: Actions = {
	default: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const fd = await event.request.formData();
		const { values: partValues, candidate } = partFromForm(fd);
		// An optional .model card, pasted or as a file, read as the edit page's import reads it.
		const card = await cardTextFrom(fd);
		const source = String(fd.get('source') ?? '').trim();
		const values = { ...partValues, card, source };
		const errors: Record<string, string> = {};
		let model;
		let modelSource;
		if (card.trim()) {
			try {
				const read = catalogue.cardModel(card, materialOf(candidate));
				model = read.model;
				modelSource = source || `.model ${read.name}`;
			} catch (e) {
				if (!(e instanceof DomainError)) throw e;
				errors.card = e.message;
			}
		}
		const parsed = partInput.safeParse({ ...candidate, ...(model ? { model, modelSource } : {}) });
		if (!parsed.success) Object.assign(errors, partFormErrors(parsed.error));
		if (!parsed.success || errors.card) return fail(400, { values, errors });
		let id: number;
		try {
			id = (await catalogue.create(user, parsed.data)).id;
		} catch (e) {
			return formFailure(e, (d) => ({ values, errors: { [d.issues?.[0]?.path ?? 'form']: d.message } }));
		}
		redirect(303, `/parts/${id}`);
	}
};
