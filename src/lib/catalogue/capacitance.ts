// What the catalogue keeps of capacitance measurements: the stored shape of a C–V fit, the
// part's capacitance (median over its samples' C–V fits, or a given card's), and the
// curves screens draw. Importable by browser code; the Drizzle schema reads these types.
import { median } from 'simple-statistics';
import { depletionCapacitanceAt, junctionPotentialAt } from '../junction';

/** Which kind of sweep a run holds: current against voltage, or capacitance against voltage. */
export const MEASUREMENTS = ['iv', 'cv'] as const;
export type Measurement = (typeof MEASUREMENTS)[number];
export const MEASUREMENT_LABEL: Record<Measurement, string> = { iv: 'I–V (current)', cv: 'C–V (capacitance)' };

/** SPICE depletion parameters as fitted at the measurement temperature TNOM [°C]. */
export type CapacitanceModel = { CJO: number; VJ: number; M: number; FC: number; TNOM: number };

export type CvFitInterval = { CJO: [number, number]; VJ: [number, number]; M: [number, number] };
export type CvFitQuality = {
	points: number;
	/** Points at or above FC·VJ, left out of the fit. */
	excluded: number;
	rejected: number;
	/** RMS of (measured / model − 1) over the fitted points. */
	rmsRelative: number;
	/** Correlation of the VJ and M estimates. */
	correlation: number;
	/** Points left out by the librarian's voltage window. */
	leftOut?: number;
};
export type CvFitRange = { voltageV: [number, number]; capacitanceF: [number, number]; fittedV: [number, number]; temperatureC: number };

/** A C–V fit as stored: the parameters, their intervals and what they rest on. */
export type StoredCvFit = {
	model: CapacitanceModel;
	interval: CvFitInterval;
	quality: CvFitQuality;
	range: CvFitRange;
	excludedV: [number, number] | null;
	/** Stray (fixture) capacitance subtracted before fitting [F]. */
	strayCapacitanceF: number;
};

/** Where a part's capacitance comes from: its own C–V runs, or a card or datasheet. */
export type CapacitanceSource = 'measured' | 'given';

/** One sample's C–V fit as the part's capacitance uses it. */
export type SampleCapacitance = { sampleId: number; unit: string; runId: number; CJO: number; VJ: number; M: number; FC: number; temperatureC: number };

/** A part's capacitance: typical parameters at TNOM, their spread over samples, and the samples. */
export type PartCapacitance = {
	source: CapacitanceSource;
	typical: CapacitanceModel;
	/** Min–max over the samples (empty for a given card). */
	spread: Partial<Record<'CJO' | 'VJ' | 'M', [number, number]>>;
	/** Each sample's own fit, as measured (at its run's temperature). */
	samples: SampleCapacitance[];
};

/**
 * Depletion parameters measured at one temperature carried to another [°C] by the SPICE
 * junction-potential and CJO scaling (the engine's, ngspice diotemp.c); M and FC unchanged.
 * @throws RangeError from the engine when VJ would become non-positive.
 */
export function capacitanceAt(m: CapacitanceModel, temperatureC: number): CapacitanceModel {
	if (Math.abs(m.TNOM - temperatureC) < 1e-9) return m;
	const { VJ, CJO } = junctionPotentialAt(m, temperatureC);
	return { CJO, VJ, M: m.M, FC: m.FC, TNOM: temperatureC };
}

/**
 * The part's capacitance from its samples' C–V fits: each sample's parameters carried to
 * `tnomC` (the part model's TNOM), then the median of each parameter over the samples
 * (on its own, as the part's Shockley parameters), with the min–max spread.
 * @throws RangeError for an empty list.
 */
export function measuredCapacitance(samples: SampleCapacitance[], tnomC: number): PartCapacitance {
	if (samples.length === 0) throw new RangeError('no sample C–V fits to aggregate');
	const atNom = samples.map((s) => capacitanceAt({ CJO: s.CJO, VJ: s.VJ, M: s.M, FC: s.FC, TNOM: s.temperatureC }, tnomC));
	const spread: PartCapacitance['spread'] = {};
	const typical: CapacitanceModel = { CJO: 0, VJ: 0, M: 0, FC: median(atNom.map((m) => m.FC)), TNOM: tnomC };
	for (const k of ['CJO', 'VJ', 'M'] as const) {
		const vals = atNom.map((m) => m[k]);
		typical[k] = median(vals);
		spread[k] = [Math.min(...vals), Math.max(...vals)];
	}
	return { source: 'measured', typical, spread, samples };
}

/** Points of the depletion formula over [lo, hi] for a chart: { x: bias V, y: C in F }, up to FC·VJ. */
export function capacitanceCurve(m: Pick<CapacitanceModel, 'CJO' | 'VJ' | 'M' | 'FC'>, lo: number, hi: number, n = 100): { x: number; y: number }[] {
	const top = Math.min(hi, m.FC * m.VJ);
	if (!(top > lo)) return [];
	return Array.from({ length: n }, (_, k) => lo + ((top - lo) * k) / (n - 1)).map((v) => ({ x: v, y: depletionCapacitanceAt(m, v) }));
}

/**
 * Each measured point's residual against a fit, 100·((C − stray) / model − 1), for the points
 * the fit used (below FC·VJ and outside the left-out window).
 */
export function capacitanceResiduals(points: [number, number][], fit: Pick<StoredCvFit, 'model' | 'excludedV' | 'strayCapacitanceF'>): { x: number; y: number }[] {
	const { model, excludedV } = fit;
	return points
		.filter(([v]) => v < model.FC * model.VJ && !(excludedV && v >= excludedV[0] && v <= excludedV[1]))
		.map(([v, c]) => ({ x: v, y: 100 * ((c - fit.strayCapacitanceF) / depletionCapacitanceAt(model, v) - 1) }));
}
