import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { DomainError, pageError } from '$lib/server/errors';
import * as catalogue from '$lib/server/catalogue';
import { cardTextFrom } from '$lib/catalogue/model-card';
import { fieldErrors, partFormErrors, partFromForm, partInput, sampleInput } from '$lib/schemas/catalogue';
import { quantityText } from '$lib/quantity';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'catalogue:write');
	const d = await catalogue.detailOr404(Number(event.params.id)).catch(pageError);
	const p = d.part;
	return {
		part: { id: p.id, partNumber: p.partNumber, lifecycle: p.lifecycle, givenModel: p.givenModel, givenModelSource: p.givenModelSource, measured: d.model?.isMeasured ?? false },
		values: {
			partNumber: p.partNumber,
			maker: p.maker,
			kind: p.kind,
			material: p.material,
			package: p.package,
			admitsLight: p.admitsLight,
			anodePins: p.anodePins,
			cathodePins: p.cathodePins,
			reverseV: quantityText(p.ratedReverseV, 'voltage'),
			forwardA: quantityText(p.ratedForwardA, 'current'),
			junctionC: quantityText(p.ratedJunctionC, 'temperature'),
			tags: p.tags.join(', '),
			notes: p.notes,
			lifecycle: p.lifecycle
		},
		samples: d.samples.map((s) => ({ id: s.id, unit: s.unit, lot: s.lot, dateCode: s.dateCode, runs: d.runs.filter((r) => r.sampleId === s.id).length }))
	};
};

/** A domain refusal as form errors beside the field it names. */
function refusal(e: unknown): { status: number; errors: Record<string, string> } {
	if (e instanceof DomainError) return { status: e.status, errors: { [e.issues?.[0]?.path ?? 'form']: e.message } };
	throw e;
}

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const id = Number(event.params.id);
		const { values, candidate } = partFromForm(await event.request.formData());
		const parsed = partInput.safeParse(candidate);
		if (!parsed.success) return fail(400, { save: { values, errors: partFormErrors(parsed.error) } });
		try {
			const { model: _m, modelSource: _s, ...rest } = parsed.data;
			void _m;
			void _s;
			await catalogue.update(user, id, rest);
		} catch (e) {
			const r = refusal(e);
			return fail(r.status, { save: { values, errors: r.errors } });
		}
		redirect(303, `/parts/${id}`);
	},
	sample: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const f = await event.request.formData();
		const values = { unit: String(f.get('unit') ?? ''), lot: String(f.get('lot') ?? ''), dateCode: String(f.get('dateCode') ?? '') };
		const parsed = sampleInput.safeParse(values);
		if (!parsed.success) return fail(400, { sample: { values, errors: fieldErrors(parsed.error) } });
		try {
			await catalogue.addSample(user, Number(event.params.id), parsed.data);
		} catch (e) {
			const r = refusal(e);
			return fail(r.status, { sample: { values, errors: r.errors } });
		}
		return { sampleAdded: parsed.data.unit };
	},
	card: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const f = await event.request.formData();
		const values = { card: await cardTextFrom(f), source: String(f.get('source') ?? '') };
		if (!values.card.trim()) return fail(400, { card: { values, errors: { card: 'Paste a .model card, e.g. .model X D(IS=2f N=1.02 RS=5).' } as Record<string, string> } });
		try {
			const r = await catalogue.importModelCard(user, Number(event.params.id), values.card, values.source);
			return { cardImported: { name: r.name, warnings: r.warnings } };
		} catch (e) {
			const r = refusal(e);
			return fail(r.status, { card: { values, errors: r.errors } });
		}
	},
	lifecycle: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const to = String((await event.request.formData()).get('to') ?? '');
		const parsed = partInput.shape.lifecycle.safeParse(to);
		if (!parsed.success) return fail(400, { lifecycleError: 'Unknown lifecycle.' });
		await catalogue.update(user, Number(event.params.id), { lifecycle: parsed.data });
		return { lifecycleSet: parsed.data };
	}
};
