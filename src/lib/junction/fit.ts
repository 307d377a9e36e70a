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

function forwardPoints(run: SweepRun): { I: number[]; V: number[] } {
	const I: number[] = [];
	const V: number[] = [];
	for (let k = 0; k < run.voltageV.length; k++) {
		if (run.voltageV[k] > 0 && run.currentA[k] > 0) {
			I.push(run.currentA[k]);
			V.push(run.voltageV[k]);
		}
	}
	return { I, V };
}

/** Reasons a run cannot support a fit (empty when it can). */
function checkRun(run: SweepRun, minPoints: number, minDecades: number): string[] {
	const reasons: string[] = [];
	const at = `at ${run.temperatureC.toFixed(1)} °C`;
	let fwd = 0;
	let wrong = 0;
	for (let k = 0; k < run.voltageV.length; k++) {
		if (run.voltageV[k] > 0) {
			fwd++;
			if (run.currentA[k] < 0) wrong++;
		}
	}
	if (fwd > 0 && wrong * 2 > fwd)
		return [`${at}: current is negative at forward bias in ${wrong} of ${fwd} points (wrong sign; swap the leads or the sign convention)`];
	if (fwd === 0) {
		let revWrong = 0;
		let rev = 0;
		for (let k = 0; k < run.voltageV.length; k++)
			if (run.voltageV[k] < 0) {
				rev++;
				if (run.currentA[k] > 0) revWrong++;
			}
		if (rev > 0 && revWrong * 2 > rev)
			return [`${at}: current is positive at reverse bias (wrong sign), and there are no forward-bias points`];
		return [`${at}: no forward-bias points; IS and N need a forward sweep`];
	}
	const { I, V } = forwardPoints(run);
	if (I.length < minPoints) reasons.push(`${at}: too few forward points (${I.length}; need at least ${minPoints})`);
	if (I.length >= 2) {
		const lo = Math.min(...I);
		const hi = Math.max(...I);
		const decades = Math.log10(hi / lo);
		if (decades < minDecades)
			reasons.push(`${at}: forward current spans ${decades.toFixed(2)} decades; need at least ${minDecades}`);
		let drops = 0;
		let bigDrop = false;
		for (let k = 1; k < I.length; k++) {
			if (V[k] > V[k - 1] && I[k] < 0.9 * I[k - 1]) {
				drops++;
				if (I[k] < 0.5 * I[k - 1]) bigDrop = true;
			}
		}
		if (bigDrop || drops > Math.max(1, 0.05 * I.length))
			reasons.push(`${at}: forward current is not monotonic in voltage (${drops} drops); check for range switching or heating`);
	}
	return reasons;
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

/** The runs without the merged points whose voltage lies in [lo, hi], and how many raw points those held. */
function excludeWindow(runs: SweepRun[], [lo, hi]: [number, number]): { runs: SweepRun[]; excluded: number } {
	if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) throw new RangeError(`excludeV must be a finite [lo, hi] with lo ≤ hi, got [${lo}, ${hi}]`);
	let excluded = 0;
	const out = runs.map((r) => {
		const keep: number[] = [];
		for (let k = 0; k < r.voltageV.length; k++) {
			if (r.voltageV[k] < lo || r.voltageV[k] > hi) keep.push(k);
			else excluded += r.count[k];
		}
		return {
			...r,
			voltageV: Float64Array.from(keep, (k) => r.voltageV[k]),
			currentA: Float64Array.from(keep, (k) => r.currentA[k]),
			count: Int32Array.from(keep, (k) => r.count[k]),
			points: keep.reduce((a, k) => a + r.count[k], 0)
		};
	});
	return { runs: out, excluded };
}

/**
 * Fit a junction model to a parsed sweep (one run, or several at different temperatures).
 * Returns the model with 95 % intervals, fit quality and the measured range.
 * @throws FitError with plain reasons when the data cannot support a fit.
 */
export function fitSweep(sweep: ParsedSweep, options: FitOptions = {}): FitResult {
	const constants = options.constants ?? SI_2019;
	const material = canonicalMaterial(options.material ?? 'silicon');
	const minPoints = options.minPoints ?? 5;
	const minDecades = options.minDecades ?? 1;
	const XTI = options.XTI ?? MATERIAL_DEFAULTS[material].XTI;
	const cut = options.excludeV ? excludeWindow(sweep.runs, options.excludeV) : null;
	const runs = cut ? cut.runs : sweep.runs;
	const reasons = runs.flatMap((r) => checkRun(r, minPoints, minDecades));
	if (reasons.length) throw new FitError(reasons);
	const fitEG = runs.length >= 2;
	const egDefault = options.EG ?? MATERIAL_DEFAULTS[material].EG;
	const egAssumed = !fitEG && options.EG === undefined && MATERIAL_DEFAULTS[material].assumed === true;
	// Nominal temperature: the run nearest 27 °C, so IS is reported where it was measured.
	const nomRun = runs.reduce((b, r) => (Math.abs(r.temperatureC - 27) < Math.abs(b.temperatureC - 27) ? r : b));
	const tnomC = Math.round(nomRun.temperatureC * 100) / 100;
	const tnK = celsiusToKelvin(tnomC);

	const pts: Pts = { I: [], V: [], Tk: [], vt: [] };
	const starts: { lnIS: number; N: number; RS: number; Tk: number }[] = [];
	for (const run of runs) {
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
	const N0 = starts.reduce((a, s) => a + s.N, 0) / starts.length;
	const RS0 = Math.max(0, starts.reduce((a, s) => a + s.RS, 0) / starts.length);
	let EG0 = egDefault;
	let lnIS0 = starts.find((s) => Math.abs(s.Tk - tnK) < 1e-9)?.lnIS ?? starts[0].lnIS;
	if (fitEG) {
		// N·ln IS(T) − XTI·ln T = const − EG·q/(k·T): a straight line in 1/T gives the EG start.
		const y = starts.map((s) => N0 * s.lnIS - XTI * Math.log(s.Tk));
		const x = starts.map((s) => -constants.q / (constants.k * s.Tk));
		const [eg, c] = leastSquares([x, starts.map(() => 1)], y);
		if (eg > 0.05 && eg < 6) EG0 = eg;
		lnIS0 = (c + XTI * Math.log(tnK) - (EG0 * constants.q) / (constants.k * tnK)) / N0;
		if (!Number.isFinite(lnIS0)) lnIS0 = starts[0].lnIS;
	}
	const ev = evaluator(pts, tnK, XTI, egDefault, fitEG);
	let start = fitEG ? [lnIS0, N0, RS0, EG0] : [lnIS0, N0, RS0];
	let p = runLM(pts, ev, start, fitEG);

	// Reject points with residuals beyond 5 robust σ (and 1 mV), then refit once.
	let r = residuals(pts, ev, p);
	const sigma = 1.4826 * median(r.map(Math.abs));
	const limit = Math.max(5 * sigma, 1e-3);
	const bad = r.map((x) => Math.abs(x) > limit);
	const nBad = bad.filter(Boolean).length;
	let usePts = pts;
	let useEv = ev;
	if (nBad > 0 && pts.I.length - nBad >= minPoints) {
		const f = <T>(a: T[]) => a.filter((_, k) => !bad[k]);
		usePts = { I: f(pts.I), V: f(pts.V), Tk: f(pts.Tk), vt: f(pts.vt) };
		useEv = evaluator(usePts, tnK, XTI, egDefault, fitEG);
		start = p;
		p = runLM(usePts, useEv, start, fitEG);
		r = residuals(usePts, useEv, p);
	}
	const n = usePts.I.length;
	const np = p.length;
	const ssr = r.reduce((a, x) => a + x * x, 0);
	const dof = Math.max(1, n - np);
	const s2 = ssr / dof;
	const jac = useEv.jac(p);
	const jtj = Array.from({ length: np }, () => new Array<number>(np).fill(0));
	for (let k = 0; k < n; k++) {
		const row = jac(k);
		for (let i = 0; i < np; i++) for (let j = 0; j < np; j++) jtj[i][j] += row[i] * row[j];
	}
	let cov: number[][];
	try {
		cov = invert(jtj).map((row) => row.map((v) => v * s2));
	} catch {
		throw new FitError(['the data do not determine IS, N and RS separately (singular fit); extend the current range']);
	}
	const t = tQuantile975(dof);
	const sd = (i: number) => Math.sqrt(Math.max(0, cov[i][i]));
	const IS = Math.exp(p[0]);
	const N = p[1];
	const RS = p[2];
	const interval: FitResult['interval'] = {
		IS: [Math.exp(p[0] - t * sd(0)), Math.exp(p[0] + t * sd(0))],
		N: [N - t * sd(1), N + t * sd(1)],
		RS: [Math.max(0, RS - t * sd(2)), RS + t * sd(2)]
	};
	const EG = fitEG ? p[3] : egDefault;
	if (fitEG) interval.EG = [EG - t * sd(3), EG + t * sd(3)];

	// Shunt: current left over after the Shockley term at reverse / near-zero points of the nominal run.
	let RSH: number | undefined;
	const nomVt = (constants.k * tnK) / constants.q;
	let sxy = 0;
	let sxx = 0;
	let m = 0;
	const shuntPts: { v: number; i: number }[] = [];
	for (let k = 0; k < nomRun.voltageV.length; k++) {
		const v = nomRun.voltageV[k];
		if (v < 3 * N * nomVt && v !== 0) {
			const ish = nomRun.currentA[k] - IS * Math.expm1(v / (N * nomVt));
			shuntPts.push({ v, i: ish });
			sxy += v * ish;
			sxx += v * v;
			m++;
		}
	}
	const warnings: DataIssue[] = [...sweep.warnings];
	if (m >= 2 && sxx > 0) {
		const g = sxy / sxx;
		const resid = shuntPts.reduce((a, q) => a + (q.i - g * q.v) ** 2, 0);
		const seG = m > 1 ? Math.sqrt(resid / Math.max(1, m - 1) / sxx) : Infinity;
		// Keep the shunt only when it is resolved from zero (95 %) — otherwise the data show no shunt.
		if (g > 0 && g > tQuantile975(Math.max(1, m - 1)) * seG) {
			RSH = 1 / g;
			const tg = tQuantile975(Math.max(1, m - 1));
			// g − t·se > 0 here (that is the test above), so the upper end is finite and positive.
			interval.RSH = [1 / (g + tg * seG), 1 / (g - tg * seG)];
		}
	}
	if (RS > 0 && interval.RS[0] === 0) warnings.push({ message: 'RS is not resolved from zero by these data' });
	if (egAssumed)
		warnings.push({
			message: `EG ${EG} eV assumed for a ${material} junction (it varies widely between wide-gap materials); give EG or measure at two or more temperatures`
		});

	let model: JunctionModel;
	try {
		model = createModel({ IS, N, RS, RSH, EG, XTI, TNOM: tnomC, ...(egAssumed ? { egAssumed: true as const } : {}) }, material);
	} catch (e) {
		throw new FitError([`fitted parameters are outside the physical domain: ${(e as Error).message}`]);
	}
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
	const temps = runs.map((r2) => r2.temperatureC);
	return {
		model,
		interval,
		quality: {
			points: n,
			rejected: sweep.rejected + (pts.I.length - n),
			rmsResidualV: Math.sqrt(ssr / n),
			...(cut ? { excluded: cut.excluded } : {})
		},
		range: {
			currentA: [Math.min(...usePts.I), Math.max(...usePts.I)],
			voltageV: [vmin, vmax],
			temperatureC: temps.length === 1 ? temps[0] : [Math.min(...temps), Math.max(...temps)],
			temperaturesC: temps,
			reverseMeasured: reverse,
			minAbsCurrentA: Number.isFinite(minAbs) ? minAbs : 0
		},
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
