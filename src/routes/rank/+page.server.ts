import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { can } from '$lib/permissions';
import { requirePermission } from '$lib/server/guards';
import { formFailure } from '$lib/server/errors';
import { rankCatalogue } from '$lib/server/ranking';
import { modelCache } from '$lib/server/model-cache';
import { SNAPSHOT_MAX_PARTS } from '$lib/rank/snapshot-limits';
import { deletePreset, listPresets, presetForm, savePreset } from '$lib/server/rank-presets';
import { fieldsFromQuery, parseFields } from '$lib/rank/operating-point-url';
import { CURVE_COUNT, RANK_PAGE_ROWS, SHOW_ALL_PARAM } from './limits';
import type { Actions, PageServerLoad } from './$types';

// The page ranks on the server too, so the GET form works without JavaScript.
export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'rank:use');
	const fields = fieldsFromQuery(event.url.searchParams);
	const { op, errors } = parseFields(fields);
	const [result, presets, cache] = await Promise.all([
		op ? rankCatalogue(op, RANK_PAGE_ROWS, CURVE_COUNT) : Promise.resolve(null),
		listPresets(user.id),
		modelCache()
	]);
	const showAll = event.url.searchParams.get(SHOW_ALL_PARAM) === 'all';
	// With JavaScript, later rankings are made in the browser unless the catalogue is too large for it.
	const rankInBrowser = cache.snapshot.parts.length <= SNAPSHOT_MAX_PARTS;
	return { fields, errors, result, presets, showAll, rankInBrowser, canShortlist: can(user, 'shortlist:edit'), canCreateProject: can(user, 'project:create') };
};

export const actions: Actions = {
	savePreset: async (event) => {
		const user = requirePermission(event, 'rank:use');
		const form = Object.fromEntries(await event.request.formData());
		const parsed = presetForm.safeParse(form);
		if (!parsed.success) return fail(400, { presetError: parsed.error.issues[0]?.message ?? 'Check the preset.' });
		try {
			await savePreset(user.id, parsed.data);
		} catch (e) {
			return formFailure(e, (d) => ({ presetError: d.message }));
		}
		return { presetSaved: parsed.data.name };
	},
	deletePreset: async (event) => {
		const user = requirePermission(event, 'rank:use');
		const id = z.coerce.number().int().positive().safeParse((await event.request.formData()).get('id'));
		if (!id.success) return fail(400, { presetError: 'Which preset? The form lost its id.' });
		await deletePreset(user.id, id.data);
		return { presetDeleted: true };
	}
};
