/**
 * Fitting the Shockley junction model to measured I–V sweeps.
 *
 * Forward points are fitted with the residual in volts,
 *   V(I) = N·Vt(T)·ln(1 + I/IS(T)) + I·RS,
 * because voltage noise is roughly uniform along a sweep while current errors are
 * proportional; a residual in volts weights every decade of current alike.
 * Start values come from linear least squares of V on (ln I, I, 1):
 * slope N·Vt, coefficient RS, intercept −N·Vt·ln IS. Levenberg–Marquardt
 * (ml-levenberg-marquardt) then refines [ln IS, N, RS] (and EG when runs at two or
 * more temperatures exist; XTI is held), with ln IS keeping the problem well
 * conditioned across twelve decades. 95 % intervals use cov = s²·(JᵀJ)⁻¹ and
 * Student's t. A shunt resistance is estimated from reverse or near-zero points.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { SI_2019, celsiusToKelvin, type PhysicalConstants } from './constants';
import { canonicalMaterial, createModel, MATERIAL_DEFAULTS, type JunctionMaterial, type JunctionModel } from './model';
import { FitError, type DataIssue } from './errors';
import { invert, leastSquares, tQuantile975 } from './linalg';
import { median } from 'simple-statistics';
import { parseSweepCsv, type ParsedSweep, type SweepOptions, type SweepRun } from './csv';
import { checkRun, excludeWindow, forwardPoints } from './fit-runs';

export interface FitOptions {
	constants?: PhysicalConstants;
	material?: JunctionMaterial;
	/**
	 * Activation energy to use for single-temperature data [eV] (default: the material's,
	 * MATERIAL_DEFAULTS; for wide-gap parts that default is assumed and the fit warns).
	 */
	EG?: number;
	/** Held saturation-current temperature exponent (default: material's). */
	XTI?: number;
	/** Minimum forward points (default 5). */
	minPoints?: number;
	/** Minimum decades of forward current (default 1). */
	minDecades?: number;
	/**
	 * Leave out every merged point whose voltage lies in [lo, hi] (inclusive) [V], e.g. a
	 * heating tail a librarian has marked; the raw points left out are counted in
	 * `quality.excluded`. The measured ranges then describe the points kept.
	 */
	excludeV?: [number, number];
}

/** A 95 % interval [lower, upper]. */
export type Interval = [number, number];

export interface FitResult {
	model: JunctionModel;
	/**
	 * 95 % intervals. RSH has one only when a shunt was resolved, i.e. its conductance is
	 * above zero at 95 %, so both ends of the RSH interval are finite.
	 */
	interval: { IS: Interval; N: Interval; RS: Interval; RSH?: Interval; EG?: Interval };
	/** Points fitted, raw points rejected as outliers, RMS residual [V]; `excluded` = raw points left out by `excludeV` (only when it was given). */
	quality: { points: number; rejected: number; rmsResidualV: number; excluded?: number };
	range: {
		currentA: Interval;
		voltageV: Interval;
		/** Measurement temperature (°C), or [lowest, highest] for several runs. */
		temperatureC: number | Interval;
		/** Every run temperature, °C. */
		temperaturesC: number[];
		/** True when reverse-bias points were measured (so leakage is more than the IS floor). */
		reverseMeasured: boolean;
		/** Smallest |current| measured anywhere in the sweep [A]. */
		minAbsCurrentA: number;
	};
	warnings: DataIssue[];
}

interface Pts {
	I: number[];
	V: number[];
	Tk: number[];
	vt: number[];
}

/** Linear least-squares start: V = A·ln I + RS·I + C → N = A/Vt, IS = exp(−C/A). */
function linearStart(I: number[], V: number[], vt: number): { lnIS: number; N: number; RS: number } {
	const lnI = I.map(Math.log);
	const ones = I.map(() => 1);
	let [a, rs, c] = leastSquares([lnI, I, ones], V);
	if (!(rs >= 0) || !(a > 0)) {
		[a, c] = leastSquares([lnI, ones], V);
		rs = 0;
	}
	if (!(a > 0)) a = vt;
	return { lnIS: -c / a, N: a / vt, RS: rs };
}

interface Evaluator {
	f: (p: number[]) => (k: number) => number;
	jac: (p: number[]) => (k: number) => number[];
}

/** Model V_k and its Jacobian for parameters [lnIS, N, RS] (+ EG when fitEG). */
function evaluator(pts: Pts, tnK: number, XTI: number, fixedEG: number, fitEG: boolean): Evaluator {
	const lnIsAt = (p: number[], k: number) => {
		const eg = fitEG ? p[3] : fixedEG;
		const r = pts.Tk[k] / tnK;
		return p[0] + (XTI / p[1]) * Math.log(r) + ((r - 1) * eg) / (p[1] * pts.vt[k]);
	};
	return {
		f: (p) => (k) => {
			const x = pts.I[k] * Math.exp(-lnIsAt(p, k));
			return p[1] * pts.vt[k] * Math.log1p(x) + pts.I[k] * p[2];
		},
		jac: (p) => (k) => {
			const eg = fitEG ? p[3] : fixedEG;
			const r = pts.Tk[k] / tnK;
			const x = pts.I[k] * Math.exp(-lnIsAt(p, k));
			const nvt = p[1] * pts.vt[k];
			const dfdL = (-nvt * x) / (1 + x);
			const dLdN = -(XTI * Math.log(r) + ((r - 1) * eg) / pts.vt[k]) / (p[1] * p[1]);
			const row = [dfdL, pts.vt[k] * Math.log1p(x) + dfdL * dLdN, pts.I[k]];
			if (fitEG) row.push(dfdL * ((r - 1) / (p[1] * pts.vt[k])));
			return row;
		}
	};
}

function runLM(pts: Pts, ev: Evaluator, start: number[], fitEG: boolean): number[] {
	const n = pts.I.length;
	const x = Array.from({ length: n }, (_, k) => k);
	const res = levenbergMarquardt({ x, y: pts.V }, ev.f, {
		initialValues: start,
		jacobianFunction: ev.jac,
		damping: 1e-3,
		// The linear start is close, so Gauss–Newton-like steps settle well within 30 iterations.
		maxIterations: 30,
		errorTolerance: 0,
		minValues: fitEG ? [-120, 0.3, 0, 0.05] : [-120, 0.3, 0],
		maxValues: fitEG ? [10, 10, 1e6, 6] : [10, 10, 1e6]
	});
	return res.parameterValues;
}

function residuals(pts: Pts, ev: Evaluator, p: number[]): number[] {
	const f = ev.f(p);
	return pts.V.map((v, k) => v - f(k));
}

/** What a fit holds fixed before it starts: the runs kept, the material's defaults, the nominal run. */
interface FitSetting {
	constants: PhysicalConstants;
	material: JunctionMaterial;
	XTI: number;
	minPoints: number;
	runs: SweepRun[];
	/** Raw points left out by `excludeV`, when it was given. */
	excluded?: number;
	/** EG is fitted when runs at two or more temperatures exist; otherwise egDefault is held. */
	fitEG: boolean;
	egDefault: number;
	egAssumed: boolean;
	/** The run nearest 27 °C, so IS is reported where it was measured. */
	nomRun: SweepRun;
	tnomC: number;
	tnK: number;
}

function fitSetting(sweep: ParsedSweep, options: FitOptions): FitSetting {
	const material = canonicalMaterial(options.material ?? 'silicon');
	const minPoints = options.minPoints ?? 5;
	const cut = options.excludeV ? excludeWindow(sweep.runs, options.excludeV) : null;
	const runs = cut ? cut.runs : sweep.runs;
	const reasons = runs.flatMap((r) => checkRun(r, minPoints, options.minDecades ?? 1));
	if (reasons.length) throw new FitError(reasons);
	const fitEG = runs.length >= 2;
	const nomRun = runs.reduce((b, r) => (Math.abs(r.temperatureC - 27) < Math.abs(b.temperatureC - 27) ? r : b));
	const tnomC = Math.round(nomRun.temperatureC * 100) / 100;
	return {
		constants: options.constants ?? SI_2019,
		material,
		XTI: options.XTI ?? MATERIAL_DEFAULTS[material].XTI,
		minPoints,
		runs,
		...(cut ? { excluded: cut.excluded } : {}),
		fitEG,
		egDefault: options.EG ?? MATERIAL_DEFAULTS[material].EG,
		egAssumed: !fitEG && options.EG === undefined && MATERIAL_DEFAULTS[material].assumed === true,
		nomRun,
		tnomC,
		tnK: celsiusToKelvin(tnomC)
	};
}

type RunStart = { lnIS: number; N: number; RS: number; Tk: number };

/** Every run's forward points pooled, and each run's own linear start. */
function pooledPoints(set: FitSetting): { pts: Pts; starts: RunStart[] } {
	const { constants } = set;
	const pts: Pts = { I: [], V: [], Tk: [], vt: [] };
	const starts: RunStart[] = [];
	for (const run of set.runs) {
		const { I, V } = forwardPoints(run);
		const Tk = celsiusToKelvin(run.temperatureC);
		const vt = (constants.k * Tk) / constants.q;
		let s = linearStart(I, V, vt);
		// Drop points within a few IS of zero (where ln(1+I/IS) ≠ ln(I/IS)) and refine the start.
		const keep = I.map((i) => i > 20 * Math.exp(s.lnIS));
		if (keep.filter(Boolean).length >= 4 && keep.some((k) => !k))
			s = linearStart(I.filter((_, k) => keep[k]), V.filter((_, k) => keep[k]), vt);
		starts.push({ ...s, Tk });
		for (let k = 0; k < I.length; k++) {
			pts.I.push(I[k]);
			pts.V.push(V[k]);
			pts.Tk.push(Tk);
			pts.vt.push(vt);
		}
	}
	return { pts, starts };
}

/** [lnIS, N, RS] (+ EG) to start Levenberg–Marquardt from: the runs' starts averaged, EG from a line in 1/T. */
function startValues(set: FitSetting, starts: RunStart[]): number[] {
	const { constants, XTI, tnK } = set;
	const N0 = starts.reduce((a, s) => a + s.N, 0) / starts.length;
	const RS0 = Math.max(0, starts.reduce((a, s) => a + s.RS, 0) / starts.length);
	let EG0 = set.egDefault;
	let lnIS0 = starts.find((s) => Math.abs(s.Tk - tnK) < 1e-9)?.lnIS ?? starts[0].lnIS;
	if (!set.fitEG) return [lnIS0, N0, RS0];
	// N·ln IS(T) − XTI·ln T = const − EG·q/(k·T): a straight line in 1/T gives the EG start.
	const y = starts.map((s) => N0 * s.lnIS - XTI * Math.log(s.Tk));
	const x = starts.map((s) => -constants.q / (constants.k * s.Tk));
	const [eg, c] = leastSquares([x, starts.map(() => 1)], y);
	if (eg > 0.05 && eg < 6) EG0 = eg;
	lnIS0 = (c + XTI * Math.log(tnK) - (EG0 * constants.q) / (constants.k * tnK)) / N0;
	if (!Number.isFinite(lnIS0)) lnIS0 = starts[0].lnIS;
	return [lnIS0, N0, RS0, EG0];
}

/** The fit, refitted once without points whose residual is beyond 5 robust σ (and 1 mV). */
function fitRejectingOutliers(set: FitSetting, pts: Pts, start: number[]): { p: number[]; used: Pts; ev: Evaluator; r: number[] } {
	const evOf = (q: Pts) => evaluator(q, set.tnK, set.XTI, set.egDefault, set.fitEG);
	const ev = evOf(pts);
	const p = runLM(pts, ev, start, set.fitEG);
	const r = residuals(pts, ev, p);
	const limit = Math.max(5 * 1.4826 * median(r.map(Math.abs)), 1e-3);
	const bad = r.map((x) => Math.abs(x) > limit);
	const nBad = bad.filter(Boolean).length;
	if (nBad === 0 || pts.I.length - nBad < set.minPoints) return { p, used: pts, ev, r };
	const f = <T>(a: T[]) => a.filter((_, k) => !bad[k]);
	const used = { I: f(pts.I), V: f(pts.V), Tk: f(pts.Tk), vt: f(pts.vt) };
	const usedEv = evOf(used);
	const refit = runLM(used, usedEv, p, set.fitEG);
	return { p: refit, used, ev: usedEv, r: residuals(used, usedEv, refit) };
}

/** 95 % intervals of IS, N, RS (and EG) from cov = s²·(JᵀJ)⁻¹ and Student's t; the residual sum of squares. */
function parameterIntervals(fit: { p: number[]; used: Pts; ev: Evaluator; r: number[] }, fitEG: boolean): { interval: FitResult['interval']; ssr: number } {
	const { p, used, ev, r } = fit;
	const n = used.I.length;
	const np = p.length;
	const ssr = r.reduce((a, x) => a + x * x, 0);
	const dof = Math.max(1, n - np);
	const jac = ev.jac(p);
	const jtj = Array.from({ length: np }, () => new Array<number>(np).fill(0));
	for (let k = 0; k < n; k++) {
		const row = jac(k);
		for (let i = 0; i < np; i++) for (let j = 0; j < np; j++) jtj[i][j] += row[i] * row[j];
	}
	let cov: number[][];
	try {
		cov = invert(jtj).map((row) => row.map((v) => (v * ssr) / dof));
	} catch {
		throw new FitError(['the data do not determine IS, N and RS separately (singular fit); extend the current range']);
	}
	const t = tQuantile975(dof);
	const half = (i: number) => t * Math.sqrt(Math.max(0, cov[i][i]));
	const interval: FitResult['interval'] = {
		IS: [Math.exp(p[0] - half(0)), Math.exp(p[0] + half(0))],
		N: [p[1] - half(1), p[1] + half(1)],
		RS: [Math.max(0, p[2] - half(2)), p[2] + half(2)]
	};
	if (fitEG) interval.EG = [p[3] - half(3), p[3] + half(3)];
	return { interval, ssr };
}

/**
 * The shunt: the current left over after the Shockley term at reverse and near-zero points of
 * the nominal run, as a conductance through the origin. Kept only when it is resolved from
 * zero at 95 % — otherwise the data show no shunt — so both ends of its interval are finite.
 */
function shunt(run: SweepRun, IS: number, N: number, nomVt: number): { RSH: number; interval: Interval } | null {
	let sxy = 0;
	let sxx = 0;
	const shuntPts: { v: number; i: number }[] = [];
	for (let k = 0; k < run.voltageV.length; k++) {
		const v = run.voltageV[k];
		if (v < 3 * N * nomVt && v !== 0) {
			const ish = run.currentA[k] - IS * Math.expm1(v / (N * nomVt));
			shuntPts.push({ v, i: ish });
			sxy += v * ish;
			sxx += v * v;
		}
	}
	const m = shuntPts.length;
	if (m < 2 || !(sxx > 0)) return null;
	const g = sxy / sxx;
	const resid = shuntPts.reduce((a, q) => a + (q.i - g * q.v) ** 2, 0);
	const seG = Math.sqrt(resid / (m - 1) / sxx);
	const tg = tQuantile975(m - 1);
	if (!(g > 0 && g > tg * seG)) return null;
	// g − t·se > 0 here (that is the test above), so the upper end is finite and positive.
	return { RSH: 1 / g, interval: [1 / (g + tg * seG), 1 / (g - tg * seG)] };
}

/** The voltage span, the smallest |current| and whether reverse bias was measured, over every run kept. */
function measuredRange(runs: SweepRun[], used: Pts): FitResult['range'] {
	let vmin = Infinity;
	let vmax = -Infinity;
	let minAbs = Infinity;
	let reverse = false;
	for (const run of runs) {
		for (let k = 0; k < run.voltageV.length; k++) {
			vmin = Math.min(vmin, run.voltageV[k]);
			vmax = Math.max(vmax, run.voltageV[k]);
			if (run.voltageV[k] < 0) reverse = true;
		}
		if (run.minAbsCurrentA > 0) minAbs = Math.min(minAbs, run.minAbsCurrentA);
	}
	const temps = runs.map((r) => r.temperatureC);
	return {
		currentA: [Math.min(...used.I), Math.max(...used.I)],
		voltageV: [vmin, vmax],
		temperatureC: temps.length === 1 ? temps[0] : [Math.min(...temps), Math.max(...temps)],
		temperaturesC: temps,
		reverseMeasured: reverse,
		minAbsCurrentA: Number.isFinite(minAbs) ? minAbs : 0
	};
}

/**
 * Fit a junction model to a parsed sweep (one run, or several at different temperatures).
 * Returns the model with 95 % intervals, fit quality and the measured range.
 * @throws FitError with plain reasons when the data cannot support a fit.
 */
export function fitSweep(sweep: ParsedSweep, options: FitOptions = {}): FitResult {
	const set = fitSetting(sweep, options);
	const { pts, starts } = pooledPoints(set);
	const fit = fitRejectingOutliers(set, pts, startValues(set, starts));
	const { interval, ssr } = parameterIntervals(fit, set.fitEG);
	const [lnIS, N, RS] = fit.p;
	const IS = Math.exp(lnIS);
	const EG = set.fitEG ? fit.p[3] : set.egDefault;
	const sh = shunt(set.nomRun, IS, N, (set.constants.k * set.tnK) / set.constants.q);
	if (sh) interval.RSH = sh.interval;

	const warnings: DataIssue[] = [...sweep.warnings];
	if (RS > 0 && interval.RS[0] === 0) warnings.push({ message: 'RS is not resolved from zero by these data' });
	if (set.egAssumed)
		warnings.push({
			message: `EG ${EG} eV assumed for a ${set.material} junction (it varies widely between wide-gap materials); give EG or measure at two or more temperatures`
		});
	let model: JunctionModel;
	try {
		const egAssumed = set.egAssumed ? { egAssumed: true as const } : {};
		model = createModel({ IS, N, RS, RSH: sh?.RSH, EG, XTI: set.XTI, TNOM: set.tnomC, ...egAssumed }, set.material);
	} catch (e) {
		throw new FitError([`fitted parameters are outside the physical domain: ${(e as Error).message}`]);
	}
	const n = fit.used.I.length;
	return {
		model,
		interval,
		quality: {
			points: n,
			rejected: sweep.rejected + (pts.I.length - n),
			rmsResidualV: Math.sqrt(ssr / n),
			...(set.excluded !== undefined ? { excluded: set.excluded } : {})
		},
		range: measuredRange(set.runs, fit.used),
		warnings
	};
}

/**
 * Parse a CSV sweep and fit it in one call: the shape the upload endpoint returns.
 * @throws SweepError (bad file), SweepTooLargeError (too big) or FitError (data cannot support a fit).
 */
export function fitSweepCsv(text: string, options: FitOptions & SweepOptions = {}): FitResult {
	return fitSweep(parseSweepCsv(text, options), options);
}
