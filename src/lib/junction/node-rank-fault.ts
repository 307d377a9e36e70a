/**
 * The fault excursion of every catalogue part placed in a protected node's candidate
 * positions (node-rank.ts), at both temperature ends.
 *
 * A fault current I into the node (out of it) is carried by the junction that conducts in
 * that direction to the nearest terminal: anode on the node for a fault driving it up,
 * cathode for one drawing it down (fault.ts). The node then sits that junction's forward
 * voltage at |I| beyond the terminal: V_f = N·Vt·ln(1 + I/IS) + I·RS with the shunt's exact
 * correction (shockley.ts), the catalogue's vectorised form (model-table.ts) for a candidate
 * position, the worst sample being the one with the largest drop. The other junctions'
 * leakage (picoamps to nanoamps beside a fault of microamps or more) is left out: it would
 * move the drop by N·Vt·(leakage/I), far below a microvolt.
 * When a second junction conducting the same way ends on a terminal within SHARED_CLAMP_V
 * of the nearest one, the two share the current and this shortcut does not hold: null,
 * and the node is solved in full for each part (fault.ts).
 */
import type { PhysicalConstants } from './constants';
import { farTerminal, leavingSign, terminalVoltage, type NodeNetwork } from './node';
import type { RankPosition } from './node-rank-pass';
import type { CatalogueView } from './rank-types';
import { voltageAtCurrent } from './shockley';
import { scaleModel } from './temperature';

/** Terminals this close [V] to the clamping one may share a fault's current. */
const SHARED_CLAMP_V = 1;

/** Worst-sample excursion [V] per part at [cold, hot]; NaN where nothing clamps. Null when the shortcut does not hold (file header). */
export function faultEstimates(
	net: NodeNetwork,
	positions: readonly RankPosition[],
	view: CatalogueView,
	faultCurrentA: number,
	constants: PhysicalConstants
): [Float64Array, Float64Array] | null {
	const up = faultCurrentA > 0;
	const current = Math.abs(faultCurrentA);
	const signalV = up ? net.signalRangeV[1] : net.signalRangeV[0];
	const n = view.records.length;
	const out: [Float64Array, Float64Array] = [new Float64Array(n).fill(NaN), new Float64Array(n).fill(NaN)];
	const conducting = positions
		.map((p, i) => ({ i, far: terminalVoltage(net, farTerminal(p), signalV) }))
		.filter(({ i }) => leavingSign(positions[i]) === (up ? 1 : -1))
		.sort((a, b) => (up ? a.far - b.far : b.far - a.far));
	if (conducting.length === 0) return out;
	if (conducting.length > 1 && Math.abs(conducting[1].far - conducting[0].far) < SHARED_CLAMP_V) return null;
	const clamp = positions[conducting[0].i];
	const drops = new Float64Array(view.models.length);
	net.temperatureRangeC.forEach((tC, end) => {
		if (clamp.fixed) {
			const drop = Math.max(...clamp.fixed.samples.map((m) => voltageAtCurrent(scaleModel(m, tC, constants), current)));
			out[end].fill(drop);
			return;
		}
		view.models.forwardVoltages(current, tC, drops, constants);
		for (let j = 0; j < n; j++) {
			let most = -Infinity;
			for (let s = view.start[j]; s < view.start[j] + view.count[j]; s++) if (drops[s] > most) most = drops[s];
			out[end][j] = most;
		}
	});
	return out;
}
