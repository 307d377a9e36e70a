import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { pageError } from '$lib/server/errors';
import type { FitInterval, FitQuality, StoredModel } from '$lib/catalogue/models';
import { capacitanceCurve, capacitanceResiduals, type CapacitanceModel, type CvFitInterval, type CvFitQuality } from '$lib/catalogue/capacitance';
import { can } from '$lib/permissions';
import { loadPart } from '$lib/server/model-cache';
import { spiceBlock, spicePartOf } from '$lib/server/spice';
import { ivViews, leakageAgainstTemperature, referenceRow } from '$lib/catalogue/sample-curves';
import type { PageServerLoad } from './$types';

type IvFit = { version: number; model: StoredModel; interval: FitInterval; quality: FitQuality; excludedV: [number, number] | null };
type CvFit = { version: number; model: CapacitanceModel; interval: CvFitInterval; quality: CvFitQuality; excludedV: [number, number] | null; strayCapacitanceF: number };
type RunRow = Awaited<ReturnType<typeof catalogue.detailOr404>>['runs'][number];

/** A C–V run as the part page draws it: its points, its fitted curve up to FC·VJ and the residuals in percent. */
function cvRun(r: RunRow, sample: string) {
	const fit = r.fit ? ({ ...r.fit, strayCapacitanceF: r.fit.strayCapacitanceF ?? 0 } as CvFit) : null;
	const vs = r.points.map((p) => p[0]);
	return {
		id: r.id,
		sample,
		temperatureC: r.temperatureC,
		frequencyHz: r.frequencyHz,
		testLevelV: r.testLevelV,
		fileName: r.fileName,
		points: r.points,
		fit,
		curve: fit ? capacitanceCurve(fit.model, Math.min(...vs), Math.max(...vs)) : [],
		residuals: fit ? capacitanceResiduals(r.points, fit) : []
	};
}

const TEMPS = Array.from({ length: 34 }, (_, k) => -40 + 5 * k); // −40 … +125 °C
/** Where the aggregate table states leakage: a guarded input at 25 °C, and half the rating hot. */
const REFERENCE_HOT_C = 85;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'catalogue:read');
	const id = Number(event.params.id);
	const { client } = await import('$lib/server/db');
	// The models exactly as the ranking predicts with them, read beside the detail (null without a usable model).
	const [d, usable] = await Promise.all([catalogue.detailOr404(id).catch(pageError), loadPart(client, id).catch(() => null)]);
	const { part, model } = d;
	const unitOf = new Map(d.samples.map((s) => [s.id, s.unit]));
	// Withdrawn runs are listed apart: they no longer shape the model or its curves.
	const active = d.runs.filter((r) => r.state === 'active' && r.measurement === 'iv');
	const activeCv = d.runs.filter((r) => r.state === 'active' && r.measurement === 'cv');
	const cached = model ? usable : null;
	const sp = cached ? spicePartOf(cached) : null;
	// Two reverse biases worth comparing: a small one (as across a guarded input) and half the rating.
	const vr = part.ratedReverseV ?? 5;
	const biases = [-0.1, -Math.min(10, Math.max(0.5, vr / 2))];
	const leakage = sp ? biases.map((b) => ({ biasV: b, ...leakageAgainstTemperature(sp.samples, sp.typical, b, TEMPS) })) : [];
	const reference = sp && sp.samples.length ? [referenceRow(sp.samples, biases[0], 25), referenceRow(sp.samples, biases[1], REFERENCE_HOT_C)] : [];
	// Forward and reverse each over their own measured span, every sample's model at every measured temperature.
	const views = sp ? ivViews(active, sp.samples, sp.typical) : null;
	return {
		part: catalogue.present(part, model, d.capacitance),
		samples: d.samples,
		runs: active.map((r) => ({ ...r, sample: unitOf.get(r.sampleId) ?? '?', fit: r.fit as IvFit | null })),
		cvRuns: activeCv.map((r) => cvRun(r, unitOf.get(r.sampleId) ?? '?')),
		withdrawn: d.runs
			.filter((r) => r.state === 'withdrawn')
			.map((r) => ({ id: r.id, sample: unitOf.get(r.sampleId) ?? '?', measurement: r.measurement, temperatureC: r.temperatureC, fileName: r.fileName, at: r.withdrawnAt, reason: r.withdrawnReason ?? '' })),
		canShortlist: can(user, 'shortlist:edit'),
		modelUnits: sp?.samples.map((s) => s.unit) ?? [],
		leakage,
		reference,
		views,
		card: sp ? spiceBlock(sp, { sample: 'typical' }) : null
	};
};
