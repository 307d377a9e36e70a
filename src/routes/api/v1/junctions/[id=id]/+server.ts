import { json } from '@sveltejs/kit';
import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { partPatch } from '$lib/schemas/catalogue';

async function full(id: number) {
	const d = await catalogue.detailOr404(id);
	const unitOf = new Map(d.samples.map((s) => [s.id, s.unit]));
	return {
		...catalogue.present(d.part, d.model, d.capacitance),
		samples: d.samples.map((s) => ({ id: s.id, unit: s.unit, lot: s.lot, dateCode: s.dateCode })),
		runs: d.runs.map((r) => ({
			id: r.id,
			sample: unitOf.get(r.sampleId),
			measurement: r.measurement,
			temperatureC: r.temperatureC,
			direction: r.direction,
			...(r.measurement === 'cv' ? { frequencyHz: r.frequencyHz, testLevelV: r.testLevelV } : {}),
			fileName: r.fileName,
			sha256: r.sha256,
			pointCount: r.points.length,
			createdAt: r.createdAt,
			state: r.state,
			withdrawn: r.state === 'withdrawn' ? { at: r.withdrawnAt, reason: r.withdrawnReason ?? '' } : null,
			fit: r.fit,
			file: `/parts/${id}/runs/${r.id}/file`,
			run: `/api/v1/junctions/${id}/runs/${r.id}`
		}))
	};
}

export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	return json(await full(Number(event.params.id)));
});

export const PATCH = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const patch = await readJson(event, partPatch);
	await catalogue.update(user, Number(event.params.id), patch);
	return json(await full(Number(event.params.id)));
});
