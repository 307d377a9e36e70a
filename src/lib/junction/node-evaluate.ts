/**
 * Evaluating a protected node (node.ts) over its signal range at both temperature ends.
 *
 * At a signal voltage V and temperature T, position p with samples s contributes the current
 * c(p,s) = σ_p·I_s(bias_p(V), T) leaving the node (σ_p = ±1, node.ts). Sample assignments:
 * every position may hold any of its part's measured samples, independently (the same part
 * in two positions may be two different units). The net current of an assignment a is
 * Σ_p c(p, a_p); its sum separates by position, so over all assignments
 *   highest = Σ_p max_s c(p,s),   lowest = Σ_p min_s c(p,s),
 * and the worst |net current| is max(|highest|, |lowest|), reached by taking every
 * position's largest (or every position's smallest) contribution. Because a built board
 * keeps one assignment for the whole signal range, the worst over fixed assignments is the
 * same number: the maxima over assignments and over (V, T) can be taken in either order.
 * Typical: every position's median contribution (the median sample), summed.
 *
 * Statistical bound (positions with a tolerance factor k, node.ts): at each point the
 * position's sample currents share one sign (a junction's current has the sign of its bias),
 * and y_s = ln|c(p,s)| gives the one-sided normal tolerance limits exp(ȳ ± k·s_y) on the
 * magnitude (tolerance.ts; lot-to-lot leakage taken as log-normal, common practice). The
 * highest net current takes each position's upper limit where it adds to the node's current
 * and its lower limit where it subtracts (the lowest net current the other way round), the
 * same stacking as the worst assignment with the limits in place of the extreme samples. A
 * position without k (one sample, a given model) or at zero bias keeps its extreme samples.
 * Noise bound: each position's exp(ȳ + k·s_y) over y = ln S_s, powers added.
 *
 * Current noise (noise.ts): each position's power density at its bias; positions add in
 * power. Worst: each position's noisiest sample; typical: each position's median.
 *
 * Where: a grid of signal voltages (ends included) at the cold and hot ends, and around the
 * worst grid point a golden-section refinement (maximize.ts). Junction currents are
 * monotone in their bias and each bias moves with the signal at slope +1, −1 or 0 (node
 * and guard move together), so with the node at the signal voltage the net current is
 * monotone in the signal and its worst magnitude lies at an end of the range. Each
 * junction's noise power is convex in its bias (its current is, and the shunt's share is
 * constant), so the node's noise is convex in the signal and largest at an end too. These
 * curves (worst and typical current, worst and typical noise) are therefore taken at the
 * grid point where they are largest without refinement when that point is an end; the
 * bound's curves (tolerance limits need not be monotone) and any interior grid maximum
 * are refined.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import { scaleModel, type ScaledJunction } from './temperature';
import { solveBias } from './shockley';
import { noiseIsApproximate, noisePower } from './noise';
import { evenGrid, refineMaximum } from './maximize';
import { biasAt, biasRange, checkNetwork, leavingSign, NodeError, type NodeNetwork, type NodePosition } from './node';
import { positionTerms, T_BOUND_HIGH, T_BOUND_LOW, T_HIGH, T_LOW, T_NOISE_BOUND, T_NOISE_TYPICAL, T_NOISE_WORST, T_TYPICAL, TERMS } from './node-terms';

export const DEFAULT_GRID_POINTS = 101;
export const MIN_GRID_POINTS = 3;
export const MAX_GRID_POINTS = 2001;

/** Net currents and noise at one signal voltage and temperature end. */
export interface NodePoint {
	/** Largest and smallest net current over sample assignments [A] (current leaving the node positive). */
	highA: number;
	lowA: number;
	/** Whichever of highA and lowA has the larger magnitude [A]. */
	worstA: number;
	/** Every position's median sample [A]. */
	typicalA: number;
	/** Noise power density [A²/Hz]: every position's noisiest sample, and its median. */
	noiseWorst: number;
	noiseTypical: number;
	/** Net current with each position at its tolerance limits, the larger magnitude of the two stackings [A]. */
	boundA: number;
	/** Noise power density with each position at its upper tolerance limit [A²/Hz]. */
	noiseBound: number;
}

/** Where a net current is worst. */
export interface NodeExtreme {
	netCurrentA: number;
	signalV: number;
	temperatureC: number;
}

/** The worst point, with the assignment that reaches it: a sample index per position. */
export interface NodeWorst extends NodeExtreme {
	samples: number[];
}

export interface NoiseExtreme {
	/** Current-noise density at the node [A/√Hz]. */
	densityA_rtHz: number;
	signalV: number;
	temperatureC: number;
}

/** A position's share at the worst point. */
export interface PositionAtWorst {
	/** [lowest, highest] bias over the signal range [V]. */
	biasRangeV: [number, number];
	/** Current leaving the node through it at the worst point, with the worst assignment [A]. */
	currentA: number;
	/** Its noise density at the worst-noise point, with its noisiest sample [A/√Hz]. */
	noiseA_rtHz: number;
}

export interface NodeEvaluation {
	coldC: number;
	hotC: number;
	/** The grid of signal voltages [V], ascending, ends included. */
	signalV: Float64Array;
	/** Net current at each grid point, [cold, hot]: typical, and worst assignment (signed) [A]. */
	typicalA: [Float64Array, Float64Array];
	worstA: [Float64Array, Float64Array];
	worst: NodeWorst;
	typical: NodeExtreme;
	noise: { worst: NoiseExtreme & { samples: number[] }; typical: NoiseExtreme; bound: NoiseExtreme | null; approximate: boolean };
	/** The net current on the statistical bound (file header); null when no position has a tolerance factor. */
	bound: NodeExtreme | null;
	/** Net current on the bound at each grid point, [cold, hot] [A] (all NaN without a bound). */
	boundA: [Float64Array, Float64Array];
	positions: PositionAtWorst[];
}

/** A protected node with its positions' models scaled to both temperature ends. */
export class NodeCircuit {
	readonly net: NodeNetwork;
	readonly positions: readonly NodePosition[];
	readonly constants: PhysicalConstants;
	/** [cold, hot] °C. */
	readonly ends: readonly [number, number];
	/** scaled[end][position][sample]. */
	private readonly scaled: ScaledJunction[][][];
	private readonly contrib: Float64Array;
	private readonly noise: Float64Array;
	private readonly sort: Float64Array;
	private readonly terms = new Float64Array(TERMS);

	/** @throws NodeError for an invalid network, a position without samples or a model that cannot be scaled. */
	constructor(net: NodeNetwork, positions: readonly NodePosition[], constants: PhysicalConstants = SI_2019) {
		checkNetwork(net, positions);
		const empty = positions.flatMap((p, i) => (p.samples.length === 0 ? [{ path: `junctions.${i}`, message: 'This position has no model.' }] : []));
		if (empty.length) throw new NodeError(empty);
		this.net = net;
		this.positions = positions;
		this.constants = constants;
		this.ends = [net.temperatureRangeC[0], net.temperatureRangeC[1]];
		this.scaled = this.ends.map((t) => positions.map((p) => p.samples.map((m) => scaleModel(m, t, constants))));
		const most = Math.max(...positions.map((p) => p.samples.length));
		this.contrib = new Float64Array(most);
		this.noise = new Float64Array(most);
		this.sort = new Float64Array(most);
	}

	/**
	 * The largest forward bias any sample of any position sees over the signal range at the
	 * hot end, in units of that sample's N·Vt (≤ 0 when every junction stays reverse-biased).
	 */
	largestForwardBias(): number {
		let most = -Infinity;
		this.positions.forEach((p, k) => {
			const top = biasRange(this.net, p)[1];
			for (const s of this.scaled[1][k]) most = Math.max(most, top / s.nvt);
		});
		return most;
	}

	/** The scaled sample models of a position at a temperature end (0 cold, 1 hot). */
	scaledAt(end: 0 | 1, position: number): readonly ScaledJunction[] {
		return this.scaled[end][position];
	}

	/** Every sample's current leaving the node through position p [A] and its noise power [A²/Hz], into the scratch arrays. */
	private fill(end: 0 | 1, p: number, signalV: number): number {
		const pos = this.positions[p];
		const bias = biasAt(this.net, pos, signalV);
		const sign = leavingSign(pos);
		const models = this.scaled[end][p];
		for (let s = 0; s < models.length; s++) {
			const r = solveBias(models[s], bias);
			const i = Number.isFinite(r.i) ? r.i : r.i > 0 ? Number.MAX_VALUE : -Number.MAX_VALUE;
			this.contrib[s] = sign * i;
			this.noise[s] = noisePower(models[s], Number.isFinite(r.vd) ? r.vd : bias, this.constants);
		}
		return models.length;
	}

	/** Net currents and noise at a signal voltage [V] and temperature end (file header). */
	point(signalV: number, end: 0 | 1): NodePoint {
		const sum = new Float64Array(TERMS);
		const t = this.terms;
		for (let p = 0; p < this.positions.length; p++) {
			const n = this.fill(end, p, signalV);
			positionTerms(this.contrib, this.noise, 0, n, this.positions[p].boundFactor, this.sort, t);
			for (let i = 0; i < TERMS; i++) sum[i] += t[i];
		}
		const pick = (a: number, b: number) => (Math.abs(a) >= Math.abs(b) ? a : b);
		return {
			highA: sum[T_HIGH],
			lowA: sum[T_LOW],
			worstA: pick(sum[T_HIGH], sum[T_LOW]),
			typicalA: sum[T_TYPICAL],
			noiseWorst: sum[T_NOISE_WORST],
			noiseTypical: sum[T_NOISE_TYPICAL],
			boundA: pick(sum[T_BOUND_HIGH], sum[T_BOUND_LOW]),
			noiseBound: sum[T_NOISE_BOUND]
		};
	}

	/**
	 * The sample assignment reaching `highA` (or `lowA` when `toward` is 'low') at a point, and
	 * each position's current with it [A]; or, for 'noise', the noisiest sample per position
	 * and its density [A/√Hz].
	 */
	assignment(signalV: number, end: 0 | 1, toward: 'high' | 'low' | 'noise'): { samples: number[]; values: number[] } {
		const samples: number[] = [];
		const values: number[] = [];
		for (let p = 0; p < this.positions.length; p++) {
			const n = this.fill(end, p, signalV);
			const col = toward === 'noise' ? this.noise : this.contrib;
			let k = 0;
			for (let s = 1; s < n; s++) if (toward === 'low' ? col[s] < col[k] : col[s] > col[k]) k = s;
			samples.push(k);
			values.push(toward === 'noise' ? Math.sqrt(col[k]) : col[k]);
		}
		return { samples, values };
	}

	/** Whether some position has a tolerance factor, so the node has a statistical bound. */
	get hasBound(): boolean {
		return this.positions.some((p) => p.boundFactor !== undefined && p.samples.length >= 2);
	}

	/**
	 * The node over its signal range at both temperature ends: curves on a grid of
	 * `gridPoints` signal voltages and the refined worst points (file header).
	 * @throws RangeError for a grid size outside MIN_GRID_POINTS…MAX_GRID_POINTS.
	 */
	evaluate(gridPoints = DEFAULT_GRID_POINTS): NodeEvaluation {
		if (!Number.isInteger(gridPoints) || gridPoints < MIN_GRID_POINTS || gridPoints > MAX_GRID_POINTS)
			throw new RangeError(`gridPoints must be a whole number from ${MIN_GRID_POINTS} to ${MAX_GRID_POINTS}, got ${gridPoints}`);
		const xs = evenGrid(this.net.signalRangeV[0], this.net.signalRangeV[1], gridPoints);
		const bounded = this.hasBound;
		const curves = gridCurves(xs, bounded, (v, end) => this.point(v, end));
		const at = (key: CurveKey, magnitude: boolean) =>
			this.worstOf(xs, curves[key], (v, e) => (magnitude ? Math.abs(this.point(v, e)[key]) : this.point(v, e)[key]), magnitude, AT_AN_END.has(key));
		const worstAt = at('worstA', true);
		const typicalAt = at('typicalA', true);
		const noiseWorstAt = at('noiseWorst', false);
		const noiseTypicalAt = at('noiseTypical', false);
		const wp = this.point(worstAt.signalV, worstAt.end);
		const chosen = this.assignment(worstAt.signalV, worstAt.end, wp.worstA === wp.highA ? 'high' : 'low');
		const loud = this.assignment(noiseWorstAt.signalV, noiseWorstAt.end, 'noise');
		const where = (m: { signalV: number; end: 0 | 1 }) => ({ signalV: m.signalV, temperatureC: this.ends[m.end] });
		const noiseAt = (m: { signalV: number; end: 0 | 1; y: number }) => ({ densityA_rtHz: Math.sqrt(m.y), ...where(m) });
		let bound: NodeExtreme | null = null;
		let noiseBound: NoiseExtreme | null = null;
		if (bounded) {
			const b = at('boundA', true);
			bound = { netCurrentA: this.point(b.signalV, b.end).boundA, ...where(b) };
			noiseBound = noiseAt(at('noiseBound', false));
		}
		return {
			coldC: this.ends[0],
			hotC: this.ends[1],
			signalV: xs,
			typicalA: curves.typicalA,
			worstA: curves.worstA,
			boundA: curves.boundA,
			worst: { netCurrentA: wp.worstA, ...where(worstAt), samples: chosen.samples },
			typical: { netCurrentA: this.point(typicalAt.signalV, typicalAt.end).typicalA, ...where(typicalAt) },
			bound,
			noise: {
				worst: { ...noiseAt(noiseWorstAt), samples: loud.samples },
				typical: noiseAt(noiseTypicalAt),
				bound: noiseBound,
				approximate: this.positions.some((p) => p.samples.some((m) => noiseIsApproximate(m.N)))
			},
			positions: this.positions.map((p, k) => ({ biasRangeV: biasRange(this.net, p), currentA: chosen.values[k], noiseA_rtHz: loud.values[k] }))
		};
	}

	/**
	 * The larger of the two ends' refined maxima of a curve sampled on the grid (of its
	 * magnitude when `magnitude`), with the end it belongs to. Ties go to the hot end. With
	 * `endMaximum` (a curve largest at an end of the range, file header) a grid maximum at an
	 * end is taken as it is.
	 */
	private worstOf(
		xs: Float64Array,
		curves: [Float64Array, Float64Array],
		f: (signalV: number, end: 0 | 1) => number,
		magnitude = true,
		endMaximum = false
	): { signalV: number; end: 0 | 1; y: number } {
		let best = { signalV: xs[0], end: 1 as 0 | 1, y: -Infinity };
		for (const end of [1, 0] as const) {
			const ys = magnitude ? curves[end].map(Math.abs) : curves[end];
			const k = argMax(ys);
			const m = endMaximum && (k === 0 || k === ys.length - 1) ? { x: xs[k], y: ys[k] } : refineMaximum((v) => f(v, end), xs, ys);
			if (m.y > best.y) best = { signalV: m.x, end, y: m.y };
		}
		return best;
	}
}

type CurveKey = 'worstA' | 'typicalA' | 'boundA' | 'noiseWorst' | 'noiseTypical' | 'noiseBound';
/** Curves whose largest value lies at an end of the signal range (file header). */
const AT_AN_END: ReadonlySet<CurveKey> = new Set(['worstA', 'typicalA', 'noiseWorst', 'noiseTypical']);

/** Index of the largest value (the first of equals; NaN passed over). */
function argMax(ys: ArrayLike<number>): number {
	let k = 0;
	for (let i = 1; i < ys.length; i++) if (ys[i] > ys[k] || Number.isNaN(ys[k])) k = i;
	return k;
}
const CURVE_KEYS: readonly CurveKey[] = ['worstA', 'typicalA', 'boundA', 'noiseWorst', 'noiseTypical', 'noiseBound'];

/** Every curve of NodePoint on the grid at [cold, hot]; the bound's stay NaN without a bound. */
function gridCurves(xs: Float64Array, bounded: boolean, point: (v: number, end: 0 | 1) => NodePoint): Record<CurveKey, [Float64Array, Float64Array]> {
	const n = xs.length;
	const out = {} as Record<CurveKey, [Float64Array, Float64Array]>;
	for (const key of CURVE_KEYS) out[key] = [new Float64Array(n), new Float64Array(n)];
	for (const end of [0, 1] as const)
		for (let i = 0; i < n; i++) {
			const pt = point(xs[i], end);
			for (const key of CURVE_KEYS) out[key][end][i] = bounded || (key !== 'boundA' && key !== 'noiseBound') ? pt[key] : NaN;
		}
	return out;
}
