import { fail, redirect } from '@sveltejs/kit';
import { can } from '$lib/permissions';
import { NODE_PRESET_KEYS, NODE_PRESETS, type NodePresetKey } from '$lib/junction';
import { requirePermission } from '$lib/server/guards';
import { DomainError, formFailure } from '$lib/server/errors';
import { evaluateNode } from '$lib/server/node';
import { rankNodeCatalogue } from '$lib/server/node-rank';
import { nodeRankRequestSchema, type NodeRankResponse } from '$lib/schemas/node-rank';
import { nodeFromFields } from '$lib/server/node-form';
import * as projects from '$lib/server/projects';
import { applyEdit, fieldsFromQuery, presetFields, queryFromFields } from '$lib/node/node-fields';
import { nodeRequirementSchema, operatingPointOfNode, type NodeResponse } from '$lib/schemas/node';
import { isEditable } from '$lib/review-transitions';
import { createProjectSchema } from '$lib/schemas/projects';
import type { Actions, PageServerLoad } from './$types';

const isPreset = (k: string | null): k is NodePresetKey => (NODE_PRESET_KEYS as readonly string[]).includes(k ?? '');

/** Parts the screen lists, and how many of the leading ones it draws. */
const LISTED = 25;
const DRAWN = 3;

/** The ranking request for a node with candidate positions: the screen's filters and order, the leading parts' curves. */
function rankRequest(node: object, fields: ReturnType<typeof fieldsFromQuery>) {
	return nodeRankRequestSchema.parse({
		...node,
		...(fields.kinds.length ? { kinds: fields.kinds } : {}),
		...(fields.q.trim() ? { q: fields.q.trim() } : {}),
		by: fields.by,
		limit: LISTED,
		withCurves: DRAWN
	});
}

// The page evaluates on the server too, so the GET form works without JavaScript.
export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'rank:use');
	const params = event.url.searchParams;
	const preset = params.get('preset');
	let fields = isPreset(preset) ? presetFields(preset) : params.has('ja') || params.has('rn') ? fieldsFromQuery(params) : presetFields('rail-pair');
	fields = applyEdit(fields, params.get('edit'));
	const { node, candidates, errors } = await nodeFromFields(fields);
	let evaluation: NodeResponse | null = null;
	let ranking: NodeRankResponse | null = null;
	try {
		if (node && !candidates) evaluation = await evaluateNode(node);
		else if (node) ranking = await rankNodeCatalogue(rankRequest(node, fields));
	} catch (e) {
		if (!(e instanceof DomainError)) throw e;
		errors.form = e.message;
	}
	const canSave = can(user, 'shortlist:edit');
	const open = canSave ? (await projects.list()).filter((p) => isEditable(p.state)) : [];
	return {
		fields,
		errors,
		candidates,
		evaluation,
		ranking,
		query: queryFromFields(fields),
		presets: NODE_PRESET_KEYS.map((k) => ({ key: k, name: NODE_PRESETS[k].name, summary: NODE_PRESETS[k].summary })),
		canSave,
		canCreate: can(user, 'project:create'),
		projects: open.map((p) => ({ id: p.id, name: p.name, hasNode: Boolean(p.requirement.node) }))
	};
};

export const actions: Actions = {
	// The node becomes a project's requirement: an open project's, or a new project's.
	save: async (event) => {
		const user = requirePermission(event, 'shortlist:edit');
		const form = await event.request.formData();
		const query = String(form.get('query') ?? '');
		const target = String(form.get('project') ?? '');
		const name = String(form.get('name') ?? '');
		const { node, errors } = await nodeFromFields(fieldsFromQuery(new URLSearchParams(query)), nodeRequirementSchema);
		if (!node) return fail(400, { saveError: Object.values(errors)[0] ?? 'The node is not complete.' });
		let id: number;
		try {
			if (target === 'new') {
				requirePermission(event, 'project:create');
				const input = createProjectSchema.safeParse({ name, requirement: { ...operatingPointOfNode(node), node } });
				if (!input.success) return fail(400, { saveError: input.error.issues[0]?.message ?? 'The project cannot be made from this node.' });
				id = (await projects.create(input.data, user.id)).id;
			} else {
				const pid = Number(target);
				if (!Number.isInteger(pid) || pid <= 0) return fail(400, { saveError: 'Choose a project, or a new one.' });
				id = (await projects.setNode(pid, node, user.id)).id;
			}
		} catch (e) {
			return formFailure(e, (d) => ({ saveError: d.message }));
		}
		redirect(303, `/projects/${id}`);
	}
};
