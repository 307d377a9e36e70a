/**
 * The grid pass of a protected node's ranking (node-rank.ts): every catalogue part placed
 * in the candidate positions at once, evaluated at the grid's signal voltages at both
 * temperature ends with the catalogue's vectorised model table.
 *
 * A candidate position's bias at a signal voltage does not depend on the part in it
 * (node.ts), so one call of the model table gives every sample of every part its current
 * there (and its noise power, noise.ts); each part then sums its positions' terms
 * (node-terms.ts) with the fixed positions' own, exactly as NodeCircuit.point does for one
 * part, and keeps the largest of each figure over the grid with where it lies. Ties go to
 * the hot end, then to the lower signal voltage, as in NodeCircuit.evaluate. The worst and
 * typical net current and noise are largest at an end of the signal range
 * (node-evaluate.ts), which the grid includes; the bound's curves are taken at their
 * largest grid point.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import { evenGrid } from './maximize';
import { biasAt, leavingSign, type NodeNetwork, type NodePosition, type Placement } from './node';
import {
	positionTerms,
	T_BOUND_HIGH,
	T_BOUND_LOW,
	T_HIGH,
	T_LOW,
	T_NOISE_BOUND,
	T_NOISE_TYPICAL,
	T_NOISE_WORST,
	T_TYPICAL,
	TERMS
} from './node-terms';
import type { CatalogueView } from './rank-types';
import { scaleModel } from './temperature';
import { solveBias } from './shockley';
import { noisePower } from './noise';

/** A position of the node being ranked: a fixed part's samples, or null for a candidate (every catalogue part in turn). */
export type RankPosition = Placement & { fixed: NodePosition | null };

/** The figures a figure column keeps per part. */
const FIGURES = ['worst', 'typical', 'bound', 'noiseWorst', 'noiseTypical', 'noiseBound'] as const;
export type FigureKey = (typeof FIGURES)[number];

/** Per part (catalogue index), each figure's largest value over the grid and where it lies. */
export interface GridFigures {
	/** Net currents [A], signed, at the largest magnitude; noise powers [A²/Hz]. NaN for parts not evaluated (and the bound's for parts without one). */
	value: Record<FigureKey, Float64Array>;
	signalV: Record<FigureKey, Float64Array>;
	/** 0 cold, 1 hot. */
	end: Record<FigureKey, Uint8Array>;
	/** At the worst point, the smallest |median current| of any candidate position [A]. */
	quietestAtWorst: Float64Array;
}

export interface GridPassInput {
	net: NodeNetwork;
	positions: readonly RankPosition[];
	view: CatalogueView;
	include?: Uint8Array;
	/** Tolerance factor per part (NaN: no bound), for the candidate positions. */
	factor: Float64Array;
	gridPoints: number;
	constants?: PhysicalConstants;
}

/** The fixed positions' summed terms at one signal voltage and temperature. */
function fixedTerms(input: GridPassInput, scaled: ReturnType<typeof scaleModel>[][], signalV: number, constants: PhysicalConstants, out: Float64Array): void {
	out.fill(0);
	const t = new Float64Array(TERMS);
	input.positions.forEach((pos, p) => {
		if (!pos.fixed) return;
		const models = scaled[p];
		const c = new Float64Array(models.length);
		const s = new Float64Array(models.length);
		const bias = biasAt(input.net, pos, signalV);
		models.forEach((m, k) => {
			const r = solveBias(m, bias);
			c[k] = leavingSign(pos) * (Number.isFinite(r.i) ? r.i : Math.sign(r.i) * Number.MAX_VALUE);
			s[k] = noisePower(m, Number.isFinite(r.vd) ? r.vd : bias, constants);
		});
		positionTerms(c, s, 0, models.length, pos.fixed.boundFactor, new Float64Array(models.length), t);
		for (let i = 0; i < TERMS; i++) out[i] += t[i];
	});
}

/** The grid pass (file header). */
export function gridPass(input: GridPassInput): GridFigures {
	const constants = input.constants ?? SI_2019;
	const { view, net } = input;
	const n = view.records.length;
	const samples = view.models.length;
	const figures: GridFigures = {
		value: {} as Record<FigureKey, Float64Array>,
		signalV: {} as Record<FigureKey, Float64Array>,
		end: {} as Record<FigureKey, Uint8Array>,
		quietestAtWorst: new Float64Array(n).fill(NaN)
	};
	for (const key of FIGURES) {
		figures.value[key] = new Float64Array(n).fill(NaN);
		figures.signalV[key] = new Float64Array(n).fill(NaN);
		figures.end[key] = new Uint8Array(n);
	}
	const candidates = input.positions.flatMap((p, i) => (p.fixed ? [] : [i]));
	const currents = candidates.map(() => new Float64Array(samples));
	const noise = candidates.map(() => new Float64Array(samples));
	const xs = evenGrid(net.signalRangeV[0], net.signalRangeV[1], input.gridPoints);
	const most = Math.max(1, ...Array.from(view.count));
	const sort = new Float64Array(most);
	const t = new Float64Array(TERMS);
	const fixedSum = new Float64Array(TERMS);
	const sum = new Float64Array(TERMS);
	// Hot end first, so a tie keeps the hot end (NodeCircuit.evaluate does the same).
	for (const end of [1, 0] as const) {
		const tC = net.temperatureRangeC[end];
		const scaled = input.positions.map((p) => (p.fixed ? p.fixed.samples.map((m) => scaleModel(m, tC, constants)) : []));
		for (const v of xs) {
			candidates.forEach((p, q) => {
				const bias = biasAt(net, input.positions[p], v);
				view.models.currents(bias, tC, currents[q], constants);
				view.models.noisePowers(bias, tC, currents[q], noise[q], constants);
				if (leavingSign(input.positions[p]) < 0) for (let s = 0; s < samples; s++) currents[q][s] = -currents[q][s];
			});
			fixedTerms(input, scaled, v, constants, fixedSum);
			for (let j = 0; j < n; j++) {
				if (input.include && input.include[j] === 0) continue;
				sum.set(fixedSum);
				let quietest = Infinity;
				for (let q = 0; q < candidates.length; q++) {
					positionTerms(currents[q], noise[q], view.start[j], view.count[j], input.factor[j], sort, t);
					for (let i = 0; i < TERMS; i++) sum[i] += t[i];
					quietest = Math.min(quietest, Math.abs(t[T_TYPICAL]));
				}
				const worst = Math.abs(sum[T_HIGH]) >= Math.abs(sum[T_LOW]) ? sum[T_HIGH] : sum[T_LOW];
				const bound = Math.abs(sum[T_BOUND_HIGH]) >= Math.abs(sum[T_BOUND_LOW]) ? sum[T_BOUND_HIGH] : sum[T_BOUND_LOW];
				if (keep(figures, 'worst', j, worst, true, v, end)) figures.quietestAtWorst[j] = quietest;
				keep(figures, 'typical', j, sum[T_TYPICAL], true, v, end);
				keep(figures, 'noiseWorst', j, sum[T_NOISE_WORST], false, v, end);
				keep(figures, 'noiseTypical', j, sum[T_NOISE_TYPICAL], false, v, end);
				// A part without a tolerance factor gives the node no bound (its figures stay NaN).
				if (input.factor[j] === input.factor[j] && view.count[j] >= 2) {
					keep(figures, 'bound', j, bound, true, v, end);
					keep(figures, 'noiseBound', j, sum[T_NOISE_BOUND], false, v, end);
				}
			}
		}
	}
	return figures;
}

/** Keeps a figure's value when it is the largest so far (by magnitude for currents); true when kept. */
function keep(f: GridFigures, key: FigureKey, j: number, value: number, magnitude: boolean, signalV: number, end: 0 | 1): boolean {
	const old = f.value[key][j];
	const bigger = magnitude ? Math.abs(value) > Math.abs(old) : value > old;
	if (!(old === old) || bigger) {
		f.value[key][j] = value;
		f.signalV[key][j] = signalV;
		f.end[key][j] = end;
		return true;
	}
	return false;
}
