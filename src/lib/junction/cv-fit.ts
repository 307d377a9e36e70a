/**
 * Fitting the SPICE depletion-capacitance formula to a measured C–V sweep:
 *
 *   C(V) = CJO / (1 − V/VJ)^M        for V < FC·VJ
 *
 * (SPICE2, Nagel, UCB/ERL M520, 1975; as in ngspice's diode model). Points at or above
 * FC·VJ, where SPICE linearises the formula and real junctions add diffusion capacitance,
 * are left out and counted (`quality.excluded`); since VJ is fitted, the set is found
 * again after each fit until it no longer changes.
 *
 * The residual is ln C_measured − ln C_model, i.e. relative, because an LCR meter's error is
 * a fraction of its reading. For a fixed VJ the model is linear in ln CJO and M:
 * ln C = ln CJO − M·ln(1 − V/VJ); a scan over VJ with that log–log straight-line fit gives the
 * start, and Levenberg–Marquardt (ml-levenberg-marquardt) refines [ln CJO, VJ, M] together.
 * 95 % intervals use cov = s²·(JᵀJ)⁻¹ with s² = SSR/(n − 3) and Student's t (n − 3 degrees of
 * freedom). Near zero bias VJ and M are told apart by the curvature of ln C against
 * ln(1 − V/VJ); far into reverse bias they trade off, and the intervals say so (wide, with the
 * VJ–M correlation reported and a warning) rather than giving false precision.
 *
 * A stray (fixture, lead) capacitance in parallel with the junction may be given: it is
 * subtracted from every reading before the fit.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { FitError, type DataIssue } from './errors';
import { invert, leastSquares, tQuantile975 } from './linalg';
import type { Interval } from './fit';
import type { DepletionParameters } from './capacitance';
import { parseCapacitanceCsv, type CapacitanceRun, type ParsedCapacitanceSweep } from './cv-csv';
import type { SweepOptions } from './csv';

export interface CapacitanceFitOptions {
	/** SPICE's forward-bias coefficient FC (default 0.5, the SPICE default). */
	FC?: number;
	/** Stray capacitance in parallel with the junction, subtracted from each reading [F] (default 0). */
	strayCapacitanceF?: number;
	/** Leave out every point whose voltage lies in [lo, hi] [V] (counted in `quality.leftOut`). */
	excludeV?: [number, number];
	/** Fewest points the fit needs (default 5). */
	minPoints?: number;
	/** Smallest span of bias the fit needs [V] (default 1). */
	minSpanV?: number;
	/** Measurement temperature [°C], reported in the range (default: the run's). */
	temperatureC?: number;
}

export interface CapacitanceFitResult {
	model: DepletionParameters;
	/** 95 % intervals. */
	interval: { CJO: Interval; VJ: Interval; M: Interval };
	/** Correlation of the VJ and M estimates (near ±1: the data do not tell them apart). */
	correlation: number;
	quality: {
		/** Points fitted. */
		points: number;
		/** Points at or above FC·VJ, left out of the fit. */
		excluded: number;
		/** Raw readings rejected as outliers when repeats were merged. */
		rejected: number;
		/** Points left out by `excludeV` (only when it was given). */
		leftOut?: number;
		/** RMS of (measured / model − 1) over the fitted points. */
		rmsRelative: number;
	};
	range: {
		/** Bias span of every point [V]. */
		voltageV: Interval;
		/** Junction capacitance (stray subtracted) span of every point [F]. */
		capacitanceF: Interval;
		/** Bias span of the fitted points [V]. */
		fittedV: Interval;
		temperatureC: number;
	};
	/** Each fitted point's residual, 100·(measured / model − 1). */
	residuals: { voltageV: number[]; percent: number[] };
	/** The stray capacitance subtracted [F]. */
	strayCapacitanceF: number;
	warnings: DataIssue[];
}

/** Relative RMS residual above which a C–V fit counts as poor (2 %, common practice for LCR data). */
export const POOR_CV_FIT_RELATIVE = 0.02;

type Pts = { V: number[]; lnC: number[] };

/** The bench points with the stray subtracted and the window left out; refused when a value is not above zero. */
function junctionPoints(run: CapacitanceRun, stray: number, window: [number, number] | undefined): { all: Pts; leftOut: number } {
	if (!Number.isFinite(stray) || stray < 0) throw new RangeError(`the stray capacitance must be zero or more, got ${stray}`);
	if (window && !(Number.isFinite(window[0]) && Number.isFinite(window[1]) && window[0] <= window[1]))
		throw new RangeError(`excludeV must be a finite [lo, hi] with lo ≤ hi, got [${window}]`);
	const bad: string[] = [];
	const all: Pts = { V: [], lnC: [] };
	let leftOut = 0;
	for (let k = 0; k < run.voltageV.length; k++) {
		const v = run.voltageV[k];
		const c = run.capacitanceF[k] - stray;
		if (!(c > 0)) bad.push(`${v} V`);
		if (window && v >= window[0] && v <= window[1]) {
			leftOut += run.count[k];
			continue;
		}
		all.V.push(v);
		all.lnC.push(Math.log(c));
	}
	if (bad.length)
		throw new FitError([
			`the capacitance is not above zero at ${bad.slice(0, 3).join(', ')}${bad.length > 3 ? ` and ${bad.length - 3} more` : ''}${stray > 0 ? ` once the stray ${stray} F is subtracted; the stray value is larger than the junction's` : ''}`
		]);
	return { all, leftOut };
}

const span = (V: number[]) => (V.length ? Math.max(...V) - Math.min(...V) : 0);

/** Reasons a set of points cannot support a fit: too few, too short a span, capacitance not falling with reverse bias. */
function refusals(p: Pts, minPoints: number, minSpanV: number, context: string): string[] {
	const reasons: string[] = [];
	if (p.V.length < minPoints) reasons.push(`${p.V.length} point${p.V.length === 1 ? '' : 's'}${context}; the fit needs at least ${minPoints}`);
	const s = span(p.V);
	if (s < minSpanV) reasons.push(`the bias spans ${s.toPrecision(3)} V${context}; the fit needs at least ${minSpanV} V`);
	if (p.V.length >= 3 && s > 0) {
		// ln C against V: a depletion capacitance rises toward forward bias, so the slope is positive and resolved from zero.
		const [slope] = leastSquares([p.V, p.V.map(() => 1)], p.lnC);
		const fit = p.V.map((v, k) => p.lnC[k] - slope * v);
		const mean = fit.reduce((a, x) => a + x, 0) / fit.length;
		const ssr = fit.reduce((a, x) => a + (x - mean) ** 2, 0);
		const vMean = p.V.reduce((a, x) => a + x, 0) / p.V.length;
		const sxx = p.V.reduce((a, x) => a + (x - vMean) ** 2, 0);
		const se = Math.sqrt(ssr / Math.max(1, p.V.length - 2) / sxx);
		if (!(slope > tQuantile975(Math.max(1, p.V.length - 2)) * se))
			reasons.push(
				`the capacitance does not fall with reverse bias${context} (it ${slope > 0 ? 'barely changes' : 'rises'} toward negative voltage); reverse bias is negative here: check the sign of the voltage column and the leads`
			);
	}
	return reasons;
}

/** The points below FC·VJ. */
function below(all: Pts, FC: number, VJ: number): Pts {
	const out: Pts = { V: [], lnC: [] };
	all.V.forEach((v, k) => {
		if (v < FC * VJ) out.V.push(v), out.lnC.push(all.lnC[k]);
	});
	return out;
}

/**
 * The start: for VJ on a logarithmic grid, the straight line ln C = ln CJO − M·ln(1 − V/VJ)
 * through the points below FC·VJ (least squares); the VJ whose line leaves the smallest
 * residual variance wins.
 */
function logLogStart(all: Pts, FC: number, vjMax: number): number[] {
	let best: { s2: number; p: number[] } | null = null;
	for (let g = 0; g <= 120; g++) {
		const VJ = 0.05 * (vjMax / 0.05) ** (g / 120);
		const set = below(all, FC, VJ);
		if (set.V.length < 3) continue;
		const x = set.V.map((v) => Math.log(1 - v / VJ));
		let a: number;
		let b: number;
		try {
			[b, a] = leastSquares([x, x.map(() => 1)], set.lnC);
		} catch {
			continue;
		}
		const M = Math.min(0.99, Math.max(0.01, -b));
		const ssr = set.lnC.reduce((s, y, k) => s + (y - a + M * x[k]) ** 2, 0);
		const s2 = ssr / (set.V.length - 2);
		if (!best || s2 < best.s2) best = { s2, p: [a, VJ, M] };
	}
	if (!best) throw new FitError(['fewer than 3 points lie below FC·VJ for any junction potential; measure at reverse bias']);
	return best.p;
}

const model = (p: number[]) => (v: number) => p[0] - p[2] * Math.log(1 - v / p[1]);
const jacobian = (p: number[]) => (v: number) => [1, (-p[2] * v) / (p[1] * (p[1] - v)), -Math.log(1 - v / p[1])];

/** Levenberg–Marquardt on [ln CJO, VJ, M] over a fixed set, VJ kept where every point stays below FC·VJ. */
function refine(set: Pts, start: number[], FC: number, vjMax: number): number[] {
	const vmax = Math.max(...set.V);
	const vjMin = Math.max(0.05, vmax > 0 ? (vmax / FC) * (1 + 1e-9) : 0.05);
	const init = [start[0], Math.min(vjMax, Math.max(vjMin, start[1])), start[2]];
	const res = levenbergMarquardt({ x: set.V, y: set.lnC }, model, {
		initialValues: init,
		jacobianFunction: jacobian,
		damping: 1e-2,
		maxIterations: 200,
		errorTolerance: 0,
		minValues: [-80, vjMin, 0.01],
		maxValues: [10, vjMax, 0.99]
	});
	return res.parameterValues;
}

/** Residual variance, covariance and 95 % intervals at the solution. */
function uncertainty(set: Pts, p: number[]) {
	const f = model(p);
	const jac = jacobian(p);
	const n = set.V.length;
	const r = set.V.map((v, k) => set.lnC[k] - f(v));
	const dof = Math.max(1, n - 3);
	const s2 = r.reduce((a, x) => a + x * x, 0) / dof;
	const jtj = [0, 1, 2].map(() => [0, 0, 0]);
	for (const v of set.V) {
		const row = jac(v);
		for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) jtj[i][j] += row[i] * row[j];
	}
	let cov: number[][];
	try {
		cov = invert(jtj).map((row) => row.map((x) => x * s2));
	} catch {
		throw new FitError(['the points do not determine CJO, VJ and M (singular fit); measure over a wider bias range']);
	}
	const sd = (i: number) => Math.sqrt(Math.max(0, cov[i][i]));
	const t = tQuantile975(dof);
	const correlation = sd(1) > 0 && sd(2) > 0 ? cov[1][2] / (sd(1) * sd(2)) : 0;
	const interval = {
		CJO: [Math.exp(p[0] - t * sd(0)), Math.exp(p[0] + t * sd(0))] as Interval,
		VJ: [Math.max(0, p[1] - t * sd(1)), p[1] + t * sd(1)] as Interval,
		M: [Math.max(0, p[2] - t * sd(2)), p[2] + t * sd(2)] as Interval
	};
	return { interval, correlation, relative: r.map((x) => Math.expm1(x)) };
}

function fitWarnings(p: number[], u: ReturnType<typeof uncertainty>, rms: number, vjMax: number): DataIssue[] {
	const w: DataIssue[] = [];
	const [lo, hi] = u.interval.VJ;
	if (Math.abs(u.correlation) > 0.9 && (hi - lo) / 2 > 0.25 * p[1])
		w.push({
			message: `VJ and M trade off in these data (correlation ${u.correlation.toFixed(3)}; VJ 95 % interval ${lo.toPrecision(3)} … ${hi.toPrecision(3)} V): measure closer to zero bias to tell them apart`
		});
	if (p[1] >= vjMax * (1 - 1e-6)) w.push({ message: `VJ reached ${vjMax} V, the most SPICE allows with this FC (FC·VJ ≤ 1 V)` });
	if (p[2] >= 0.99 * (1 - 1e-6)) w.push({ message: 'M reached 0.99, the most the SPICE formula allows: is this a hyperabrupt (varactor) junction?' });
	if (rms > POOR_CV_FIT_RELATIVE) w.push({ message: `the depletion formula fits poorly (RMS ${(100 * rms).toFixed(1)} %)` });
	return w;
}

/**
 * Fit CJO, VJ and M to one C–V run (merged points). See the file header for the method.
 * @throws FitError with plain reasons when the data cannot support a fit; RangeError for bad options.
 */
export function fitCapacitance(run: CapacitanceRun, options: CapacitanceFitOptions = {}, rejected = 0): CapacitanceFitResult {
	const FC = options.FC ?? 0.5;
	if (!(FC > 0 && FC < 1)) throw new RangeError(`FC must lie between 0 and 1, got ${FC}`);
	const minPoints = options.minPoints ?? 5;
	const minSpanV = options.minSpanV ?? 1;
	const stray = options.strayCapacitanceF ?? 0;
	const { all, leftOut } = junctionPoints(run, stray, options.excludeV);
	const first = refusals(all, minPoints, minSpanV, '');
	if (first.length) throw new FitError(first);
	const vjMax = 1 / FC;
	let p = logLogStart(all, FC, vjMax);
	let set = below(all, FC, p[1]);
	// The points below FC·VJ depend on VJ: fit, take the set the new VJ gives, until it settles (it only grows).
	for (let round = 0; round < 10; round++) {
		p = refine(set, p, FC, vjMax);
		const next = below(all, FC, p[1]);
		if (next.V.length === set.V.length) break;
		set = next;
	}
	const excluded = all.V.length - set.V.length;
	const again = refusals(set, minPoints, minSpanV, ` below FC·VJ = ${(FC * p[1]).toPrecision(3)} V`);
	if (again.length) throw new FitError(again);
	const u = uncertainty(set, p);
	const rms = Math.sqrt(u.relative.reduce((a, x) => a + x * x, 0) / u.relative.length);
	const caps = all.lnC.map(Math.exp);
	return {
		model: { CJO: Math.exp(p[0]), VJ: p[1], M: p[2], FC },
		interval: u.interval,
		correlation: u.correlation,
		quality: { points: set.V.length, excluded, rejected, rmsRelative: rms, ...(options.excludeV ? { leftOut } : {}) },
		range: {
			voltageV: [Math.min(...all.V), Math.max(...all.V)],
			capacitanceF: [Math.min(...caps), Math.max(...caps)],
			fittedV: [Math.min(...set.V), Math.max(...set.V)],
			temperatureC: options.temperatureC ?? run.temperatureC
		},
		residuals: { voltageV: set.V, percent: u.relative.map((x) => 100 * x) },
		strayCapacitanceF: stray,
		warnings: fitWarnings(p, u, rms, vjMax)
	};
}

/**
 * Parse a C–V CSV file holding one temperature and fit it: the shape the stateless endpoint returns.
 * @throws SweepError (bad file), FitError (data cannot support a fit).
 */
export function fitCapacitanceCsv(text: string, options: CapacitanceFitOptions & SweepOptions = {}): CapacitanceFitResult & { sweep: ParsedCapacitanceSweep } {
	const sweep = parseCapacitanceCsv(text, options);
	if (sweep.runs.length > 1) throw new FitError([`the file holds sweeps at ${sweep.runs.length} temperatures; fit one temperature at a time`]);
	const fit = fitCapacitance(sweep.runs[0], options, sweep.rejected);
	return { ...fit, warnings: [...sweep.warnings, ...fit.warnings], sweep };
}
