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
 * Current noise (noise.ts): each position's power density at its bias; positions add in
 * power. Worst: each position's noisiest sample; typical: each position's median.
 *
 * Where: a grid of signal voltages (ends included) at the cold and hot ends, and around the
 * worst grid point a golden-section refinement (maximize.ts). Junction currents are
 * monotone in their bias and each bias moves with the signal at slope +1, −1 or 0 (node
 * and guard move together), so with the node at the signal voltage the net current is
 * monotone in the signal and its worst magnitude lies at an end of the range; the grid and
 * the refinement still find an interior worst point of any curve that has one (the noise,
 * for instance, need not be monotone).
 */
import { SI_2019, type PhysicalConstants } from './constants';
import { scaleModel, type ScaledJunction } from './temperature';
import { solveBias } from './shockley';
import { noiseIsApproximate, noisePower } from './noise';
import { evenGrid, refineMaximum } from './maximize';
import { biasAt, biasRange, checkNetwork, leavingSign, NodeError, type NodeNetwork, type NodePosition } from './node';
import { medianOfPrefix as median } from './catalogue-caches';

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
	noise: { worst: NoiseExtreme & { samples: number[] }; typical: NoiseExtreme; approximate: boolean };
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
		let high = 0;
		let low = 0;
		let typical = 0;
		let noiseWorst = 0;
		let noiseTypical = 0;
		for (let p = 0; p < this.positions.length; p++) {
			const n = this.fill(end, p, signalV);
			let hi = -Infinity;
			let lo = Infinity;
			let nz = 0;
			for (let s = 0; s < n; s++) {
				hi = Math.max(hi, this.contrib[s]);
				lo = Math.min(lo, this.contrib[s]);
				nz = Math.max(nz, this.noise[s]);
			}
			high += hi;
			low += lo;
			noiseWorst += nz;
			typical += median(this.contrib, n);
			noiseTypical += median(this.noise, n);
		}
		return { highA: high, lowA: low, worstA: Math.abs(high) >= Math.abs(low) ? high : low, typicalA: typical, noiseWorst, noiseTypical };
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

	/**
	 * The node over its signal range at both temperature ends: curves on a grid of
	 * `gridPoints` signal voltages and the refined worst points (file header).
	 * @throws RangeError for a grid size outside MIN_GRID_POINTS…MAX_GRID_POINTS.
	 */
	evaluate(gridPoints = DEFAULT_GRID_POINTS): NodeEvaluation {
		if (!Number.isInteger(gridPoints) || gridPoints < MIN_GRID_POINTS || gridPoints > MAX_GRID_POINTS)
			throw new RangeError(`gridPoints must be a whole number from ${MIN_GRID_POINTS} to ${MAX_GRID_POINTS}, got ${gridPoints}`);
		const [lo, hi] = this.net.signalRangeV;
		const xs = evenGrid(lo, hi, gridPoints);
		const n = xs.length;
		const typicalA: [Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n)];
		const worstA: [Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n)];
		const noiseW: [Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n)];
		const noiseT: [Float64Array, Float64Array] = [new Float64Array(n), new Float64Array(n)];
		for (const end of [0, 1] as const)
			for (let i = 0; i < n; i++) {
				const pt = this.point(xs[i], end);
				typicalA[end][i] = pt.typicalA;
				worstA[end][i] = pt.worstA;
				noiseW[end][i] = pt.noiseWorst;
				noiseT[end][i] = pt.noiseTypical;
			}
		const worstAt = this.worstOf(xs, worstA, (v, e) => Math.abs(this.point(v, e).worstA));
		const typicalAt = this.worstOf(xs, typicalA, (v, e) => Math.abs(this.point(v, e).typicalA));
		const noiseWorstAt = this.worstOf(xs, noiseW, (v, e) => this.point(v, e).noiseWorst, false);
		const noiseTypicalAt = this.worstOf(xs, noiseT, (v, e) => this.point(v, e).noiseTypical, false);

		const wp = this.point(worstAt.signalV, worstAt.end);
		const toward = wp.worstA === wp.highA ? 'high' : 'low';
		const chosen = this.assignment(worstAt.signalV, worstAt.end, toward);
		const loud = this.assignment(noiseWorstAt.signalV, noiseWorstAt.end, 'noise');
		const tp = this.point(typicalAt.signalV, typicalAt.end);
		return {
			coldC: this.ends[0],
			hotC: this.ends[1],
			signalV: xs,
			typicalA,
			worstA,
			worst: { netCurrentA: wp.worstA, signalV: worstAt.signalV, temperatureC: this.ends[worstAt.end], samples: chosen.samples },
			typical: { netCurrentA: tp.typicalA, signalV: typicalAt.signalV, temperatureC: this.ends[typicalAt.end] },
			noise: {
				worst: {
					densityA_rtHz: Math.sqrt(noiseWorstAt.y),
					signalV: noiseWorstAt.signalV,
					temperatureC: this.ends[noiseWorstAt.end],
					samples: loud.samples
				},
				typical: { densityA_rtHz: Math.sqrt(noiseTypicalAt.y), signalV: noiseTypicalAt.signalV, temperatureC: this.ends[noiseTypicalAt.end] },
				approximate: this.positions.some((p) => p.samples.some((m) => noiseIsApproximate(m.N)))
			},
			positions: this.positions.map((p, k) => ({ biasRangeV: biasRange(this.net, p), currentA: chosen.values[k], noiseA_rtHz: loud.values[k] }))
		};
	}

	/**
	 * The larger of the two ends' refined maxima of a curve sampled on the grid (of its
	 * magnitude when `magnitude`), with the end it belongs to. Ties go to the hot end.
	 */
	private worstOf(
		xs: Float64Array,
		curves: [Float64Array, Float64Array],
		f: (signalV: number, end: 0 | 1) => number,
		magnitude = true
	): { signalV: number; end: 0 | 1; y: number } {
		let best = { signalV: xs[0], end: 1 as 0 | 1, y: -Infinity };
		for (const end of [1, 0] as const) {
			const ys = magnitude ? curves[end].map(Math.abs) : curves[end];
			const m = refineMaximum((v) => f(v, end), xs, ys);
			if (m.y > best.y) best = { signalV: m.x, end, y: m.y };
		}
		return best;
	}
}
