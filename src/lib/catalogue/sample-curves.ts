/**
 * A part's predictions per measured sample, for the part page: every sample's curve
 * (leakage against temperature at fixed reverse biases, |I| against bias at one
 * temperature), their envelope (the largest sample at each point, whichever sample that
 * is there), and a table of leakage at stated reference conditions with n, median,
 * min–max and the statistical bound. No sample is called "worst" from one probe point.
 */
import {
	DEFAULT_CONFIDENCE,
	DEFAULT_COVERAGE,
	diodeCurrent,
	logNormalUpperBound,
	toleranceFactor,
	type JunctionModel,
	type LabelledModel
} from '$lib/junction';
import { median } from 'simple-statistics';

export type Point = { x: number; y: number };
export type SampleCurve = { unit: string; points: Point[] };
export type CurveSet = { samples: SampleCurve[]; envelope: Point[]; typical: Point[] };

/** Leakage at one reference condition over a part's samples [A]. */
export type ReferenceRow = {
	biasV: number;
	temperatureC: number;
	n: number;
	median: number;
	min: number;
	max: number;
	/** Statistical bound (null with fewer than two samples), with its terms. */
	bound: number | null;
	k: number | null;
	/** The unit leaking most at this condition. */
	largestUnit: string | null;
};

/** |I| of a model at a bias [V] and temperature [°C], NaN when it cannot be evaluated. */
function leak(model: JunctionModel, biasV: number, temperatureC: number): number {
	try {
		return Math.abs(diodeCurrent(model, biasV, temperatureC));
	} catch {
		return NaN;
	}
}

/** Curves over x for every sample, their envelope and the typical model; points ≤ 0 or NaN are left out. */
function curveSet(samples: readonly LabelledModel[], typical: JunctionModel, xs: readonly number[], at: (m: JunctionModel, x: number) => number): CurveSet {
	const keep = (p: Point) => p.y > 0 && Number.isFinite(p.y);
	const curves = samples.map((s) => ({ unit: s.unit, points: xs.map((x) => ({ x, y: at(s.model, x) })) }));
	const envelope = xs.map((x, i) => ({ x, y: Math.max(...curves.map((c) => c.points[i].y).filter((y) => !Number.isNaN(y))) }));
	return {
		samples: curves.map((c) => ({ unit: c.unit, points: c.points.filter(keep) })),
		envelope: samples.length ? envelope.filter(keep) : [],
		typical: xs.map((x) => ({ x, y: at(typical, x) })).filter(keep)
	};
}

/** Leakage against temperature [°C] at a bias [V], per sample. */
export function leakageAgainstTemperature(samples: readonly LabelledModel[], typical: JunctionModel, biasV: number, temperaturesC: readonly number[]): CurveSet {
	return curveSet(samples, typical, temperaturesC, (m, t) => leak(m, biasV, t));
}

/** |I| against bias [V] at a temperature [°C], per sample. */
function currentAgainstBias(samples: readonly LabelledModel[], typical: JunctionModel, temperatureC: number, biasesV: readonly number[]): CurveSet {
	return curveSet(samples, typical, biasesV, (m, v) => leak(m, v, temperatureC));
}

/**
 * Leakage over the samples at a reference condition: n, median, min–max, the unit leaking
 * most there, and the one-sided tolerance bound (coverage and confidence defaults 0.95/0.90).
 */
export function referenceRow(
	samples: readonly LabelledModel[],
	biasV: number,
	temperatureC: number,
	coverage = DEFAULT_COVERAGE,
	confidence = DEFAULT_CONFIDENCE
): ReferenceRow {
	const values = samples.map((s) => leak(s.model, biasV, temperatureC));
	const ok = values.filter((v) => v > 0);
	const n = samples.length;
	let largestUnit: string | null = null;
	values.forEach((v, i) => {
		if (largestUnit === null || v > values[samples.findIndex((s) => s.unit === largestUnit)]) largestUnit = samples[i].unit;
	});
	const k = ok.length >= 2 && ok.length === n ? toleranceFactor(n, coverage, confidence) : null;
	return {
		biasV,
		temperatureC,
		n,
		median: n ? median(values) : NaN,
		min: n ? Math.min(...values) : NaN,
		max: n ? Math.max(...values) : NaN,
		bound: k === null ? null : logNormalUpperBound(ok, k),
		k,
		largestUnit
	};
}

/** One branch of the I–V plot: its bias span [V] and each sample's model at each temperature. */
export type IvView = { span: [number, number]; byTemperature: { temperatureC: number; curves: SampleCurve[] }[] };

/** Model curves over a bias span at each temperature (121 points). */
function branch(samples: readonly LabelledModel[], typical: JunctionModel, temperaturesC: readonly number[], lo: number, hi: number): IvView {
	const xs = Array.from({ length: 121 }, (_, k) => lo + ((hi - lo) * k) / 120);
	return {
		span: [lo, hi],
		byTemperature: temperaturesC.map((t) => ({ temperatureC: t, curves: currentAgainstBias(samples, typical, t, xs).samples }))
	};
}

/**
 * The part page's two I–V views: forward (bias > 0) over the forward span measured and
 * reverse (bias < 0) over the reverse span, each sample's model at every temperature a run
 * was measured at (25 °C when there are no runs). A branch nobody measured is null.
 */
export function ivViews(
	runs: readonly { temperatureC: number; points: readonly (readonly [number, number])[] }[],
	samples: readonly LabelledModel[],
	typical: JunctionModel
): { temperaturesC: number[]; forward: IvView | null; reverse: IvView | null } {
	const temperaturesC = [...new Set(runs.map((r) => r.temperatureC))].sort((a, b) => a - b);
	if (!temperaturesC.length) temperaturesC.push(25);
	const vs = runs.flatMap((r) => r.points.map((p) => p[0]));
	const fwd = vs.filter((v) => v > 0);
	const rev = vs.filter((v) => v < 0);
	return {
		temperaturesC,
		forward: fwd.length ? branch(samples, typical, temperaturesC, Math.min(...fwd), Math.max(...fwd)) : vs.length ? null : branch(samples, typical, temperaturesC, 0.2, 0.8),
		reverse: rev.length ? branch(samples, typical, temperaturesC, Math.min(...rev), Math.max(...rev)) : vs.length ? null : branch(samples, typical, temperaturesC, -5, -0.1)
	};
}
