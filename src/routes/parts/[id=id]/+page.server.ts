import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { currentMagnitude } from '$lib/catalogue/models';
import { can } from '$lib/permissions';
import type { PageServerLoad } from './$types';

const TEMPS = Array.from({ length: 34 }, (_, k) => -40 + 5 * k); // −40 … +125 °C

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'catalogue:read');
	const id = Number(event.params.id);
	const d = await catalogue.detailOr404(id);
	const { part, model } = d;
	const unitOf = new Map(d.samples.map((s) => [s.id, s.unit]));
	// Withdrawn runs are listed apart: they no longer shape the model or its curves.
	const active = d.runs.filter((r) => r.state === 'active');
	// Two reverse biases worth comparing: a small one (as across a guarded input) and half the rating.
	const vr = part.ratedReverseV ?? 5;
	const biases = [-0.1, -Math.min(10, Math.max(0.5, vr / 2))];
	const leakage = model
		? biases.map((b) => ({
				biasV: b,
				typical: TEMPS.map((t) => ({ x: t, y: currentMagnitude(model.typical, part.material, b, t) })).filter((p) => p.y > 0),
				worst: TEMPS.map((t) => ({ x: t, y: currentMagnitude(model.worst ?? model.typical, part.material, b, t) })).filter((p) => p.y > 0)
			}))
		: [];
	// Fitted curve of the typical model at 25 °C over the measured voltage span.
	let curve: { x: number; y: number }[] = [];
	if (model) {
		const vs = active.flatMap((r) => r.points.map((p) => p[0]));
		const lo = vs.length ? Math.min(...vs) : -1;
		const hi = vs.length ? Math.max(...vs) : 0.8;
		curve = Array.from({ length: 121 }, (_, k) => lo + ((hi - lo) * k) / 120)
			.map((v) => ({ x: v, y: currentMagnitude(model.typical, part.material, v, 25) }))
			.filter((p) => p.y > 0);
	}
	const card = model ? await catalogue.spiceCard(id) : null;
	return {
		part: catalogue.present(part, model),
		samples: d.samples,
		runs: active.map((r) => ({ ...r, sample: unitOf.get(r.sampleId) ?? '?' })),
		withdrawn: d.runs
			.filter((r) => r.state === 'withdrawn')
			.map((r) => ({ id: r.id, sample: unitOf.get(r.sampleId) ?? '?', temperatureC: r.temperatureC, fileName: r.fileName, at: r.withdrawnAt, reason: r.withdrawnReason ?? '' })),
		canShortlist: can(user, 'shortlist:edit'),
		leakage,
		curve,
		card
	};
};
