/**
 * A fault drives current into (or out of) a protected node; the protection junctions carry it
 * to the rails or the guard, and the node settles beyond the terminal it is clamped to by
 * about the conducting junction's forward drop at that current.
 *
 * With the rails fixed and the guard at its value for the end of the signal range the fault
 * pushes towards, the node voltage V_n solves
 *   Σ_p σ_p·I_p(bias_p(V_n)) = I_fault        (current leaving through the junctions = current driven in)
 * exactly, every junction included (node.ts for σ_p and the biases). The left side rises with
 * V_n (each term's slope is the junction's conductance), so the root is unique and a
 * safeguarded Newton iteration on a bracket finds it (solve.ts). The search starts where the
 * nearest junction that conducts in the fault's direction would put the node carrying the
 * whole fault current alone (its far terminal plus its forward voltage at that current, the
 * closed form of shockley.ts): the others' leakage moves the root by far less than a
 * millivolt, so the bracket around that start is found in a few steps. The junction carrying most of
 * the fault current names the terminal the node is clamped to; the excursion is how far V_n
 * lies beyond that terminal's potential in the fault's direction.
 *
 * Samples: each position's contribution is an increasing function of V_n for every sample, so
 * the assignment that puts the node farthest out is the one with the least current leaving
 * at every V_n for a fault driving current in (the most, for a fault drawing current out):
 * the root of the pointwise minimum (maximum) over each position's samples. At that root the
 * pointwise extreme is reached by one sample per position, whose assignment has the same root,
 * and every other assignment's sum lies above (below) it, so its root is nearer. Typical: each
 * position's median sample.
 */
import { solveIncreasing } from './solve';
import { junctionCurrentAndSlope, solveBias, voltageAtCurrent } from './shockley';
import { biasAt, farTerminal, leavingSign, terminalVoltage, type NodeNetwork, type NodePosition, type Terminal } from './node';
import type { ScaledJunction } from './temperature';

/** How far beyond its signal range a node is searched for before it counts as unclamped [V]. */
export const UNCLAMPED_BEYOND_V = 1000;

export interface FaultExcursion {
	/** 'above' when the fault drives current into the node, 'below' when it draws current out. */
	direction: 'above' | 'below';
	/** Node voltage with the fault [V]; null when nothing clamps it within UNCLAMPED_BEYOND_V. */
	nodeV: number | null;
	/** How far the node lies beyond the terminal it is clamped to [V] (positive = beyond). */
	excursionV: number | null;
	/** The terminal of the junction carrying most of the fault current. */
	clampedTo: Terminal | null;
	/** That junction's position. */
	position: number | null;
}

const slopeScratch = new Float64Array(2);

/** Current [A] through a scaled junction at a terminal bias and its slope dI/dV [S] (RS included). */
function currentAndConductance(s: ScaledJunction, bias: number): [number, number] {
	const { i, vd } = solveBias(s, bias);
	junctionCurrentAndSlope(s, vd, slopeScratch);
	const g = slopeScratch[1];
	return [i, s.RS > 0 ? g / (1 + s.RS * g) : g];
}

/** One position's contribution (leaving the node) and slope with its samples combined by `mode`. */
function combined(models: readonly ScaledJunction[], bias: number, sign: number, mode: 'low' | 'high' | 'median'): [number, number] {
	const pairs = models.map((m) => {
		const [i, g] = currentAndConductance(m, bias);
		return [sign * i, g] as [number, number];
	});
	if (mode !== 'median') {
		let k = 0;
		for (let s = 1; s < pairs.length; s++) if (mode === 'low' ? pairs[s][0] < pairs[k][0] : pairs[s][0] > pairs[k][0]) k = s;
		return pairs[k];
	}
	pairs.sort((a, b) => a[0] - b[0]);
	const n = pairs.length;
	if (n % 2) return pairs[n >> 1];
	const [a, b] = [pairs[n / 2 - 1], pairs[n / 2]];
	return [0.5 * (a[0] + b[0]), 0.5 * (a[1] + b[1])];
}

/**
 * The node's excursion under a fault current [A] (positive = driven into the node) at one
 * temperature, with `scaled[p]` the positions' sample models at that temperature.
 * `samples` picks the worst assignment (farthest out) or the typical one (file header).
 * @throws RangeError for a zero or non-finite fault current.
 */
export function faultExcursion(
	net: NodeNetwork,
	positions: readonly NodePosition[],
	scaled: readonly (readonly ScaledJunction[])[],
	faultCurrentA: number,
	samples: 'worst' | 'typical' = 'worst'
): FaultExcursion {
	if (!Number.isFinite(faultCurrentA) || faultCurrentA === 0) throw new RangeError(`a fault current must be finite and non-zero, got ${faultCurrentA}`);
	const up = faultCurrentA > 0;
	const direction = up ? 'above' : 'below';
	const signalV = up ? net.signalRangeV[1] : net.signalRangeV[0];
	const mode = samples === 'typical' ? 'median' : up ? 'low' : 'high';
	const residual = (nodeV: number, out: Float64Array) => {
		let sum = 0;
		let slope = 0;
		positions.forEach((pos, p) => {
			const [c, g] = combined(scaled[p], biasAt(net, pos, signalV, nodeV), leavingSign(pos), mode);
			sum += c;
			slope += g;
		});
		out[0] = sum - faultCurrentA;
		out[1] = slope;
	};
	const start = clampGuess(net, positions, scaled, faultCurrentA, signalV, samples);
	const bracket = (start !== null ? bracketAround(residual, start) : null) ?? findBracket(residual, signalV, up);
	if (!bracket) return { direction, nodeV: null, excursionV: null, clampedTo: null, position: null };
	const nodeV = solveIncreasing(residual, bracket[0], bracket[1], start ?? undefined);
	// The junction carrying most of the fault current in its direction names the clamp.
	let best = 0;
	let bestShare = -Infinity;
	positions.forEach((pos, p) => {
		const share = (up ? 1 : -1) * combined(scaled[p], biasAt(net, pos, signalV, nodeV), leavingSign(pos), mode)[0];
		if (share > bestShare) {
			bestShare = share;
			best = p;
		}
	});
	const clampedTo = farTerminal(positions[best]);
	const clampV = terminalVoltage(net, clampedTo, signalV, nodeV);
	return { direction, nodeV, excursionV: up ? nodeV - clampV : clampV - nodeV, clampedTo, position: best };
}

/**
 * Where the node would sit if the nearest junction conducting in the fault's direction
 * carried the whole fault current alone, with its sample of the largest forward voltage
 * (the median sample's for 'typical'); null when no junction conducts that way.
 */
function clampGuess(
	net: NodeNetwork,
	positions: readonly NodePosition[],
	scaled: readonly (readonly ScaledJunction[])[],
	faultCurrentA: number,
	signalV: number,
	samples: 'worst' | 'typical'
): number | null {
	const up = faultCurrentA > 0;
	const current = Math.abs(faultCurrentA);
	let best: number | null = null;
	positions.forEach((pos, p) => {
		// Driving the node up forward-biases a junction whose anode is on the node, and down one whose cathode is.
		if (leavingSign(pos) !== (up ? 1 : -1)) return;
		let drops: number[];
		try {
			drops = scaled[p].map((m) => voltageAtCurrent(m, current)).sort((a, b) => a - b);
		} catch {
			return;
		}
		const drop = samples === 'typical' ? drops[drops.length >> 1] : drops[drops.length - 1];
		const far = terminalVoltage(net, farTerminal(pos), signalV);
		const x = up ? far + drop : far - drop;
		if (best === null || (up ? x < best : x > best)) best = x;
	});
	return best;
}

/** A bracket around the root of an increasing residual near `x0`, widened in doubling steps from 1 µV; null past UNCLAMPED_BEYOND_V. */
function bracketAround(residual: (x: number, out: Float64Array) => void, x0: number): [number, number] | null {
	const out = new Float64Array(2);
	const at = (x: number) => (residual(x, out), out[0]);
	const r0 = at(x0);
	if (r0 === 0) return [x0, x0];
	if (!Number.isFinite(r0)) return null;
	const dir = r0 < 0 ? 1 : -1;
	let near = x0;
	for (let step = 1e-6; step <= UNCLAMPED_BEYOND_V; step *= 2) {
		const x = x0 + dir * step;
		const r = at(x);
		if (dir > 0 ? !(r < 0) : !(r > 0)) return dir > 0 ? [near, x] : [x, near];
		near = x;
	}
	return null;
}

/**
 * A bracket [lo, hi] around the root of an increasing residual, searched outwards from the
 * signal end in doubling steps; null when the residual keeps its sign for UNCLAMPED_BEYOND_V.
 */
function findBracket(residual: (x: number, out: Float64Array) => void, start: number, up: boolean): [number, number] | null {
	const out = new Float64Array(2);
	const at = (x: number) => (residual(x, out), out[0]);
	let near = start;
	if (up ? !(at(near) < 0) : !(at(near) > 0)) {
		// Already past the root at the signal end (a fault smaller than the node's own current).
		for (let step = 1e-3; ; step *= 2) {
			const x = up ? start - step : start + step;
			if (up ? at(x) < 0 : at(x) > 0) return up ? [x, start] : [start, x];
			if (step > UNCLAMPED_BEYOND_V) return null;
		}
	}
	for (let step = 1e-3; step <= UNCLAMPED_BEYOND_V * 2; step *= 2) {
		const x = up ? start + step : start - step;
		const v = at(x);
		if (up ? !(v < 0) : !(v > 0)) return up ? [near, x] : [x, near];
		near = x;
	}
	return null;
}
