/**
 * The protected node: a high-impedance input held at a signal voltage, with protection
 * junctions placed between it, fixed rails and a guard.
 *
 * Potentials, at a signal voltage V_sig in the signal range [V_lo, V_hi]:
 *   node   = V_sig (the source holds it there; the net current's drop across the source
 *            resistance is the error voltage, taken as small beside the junction biases)
 *   guard  = V_sig + offset (a buffer driving the guard follows the signal; its input
 *            offset appears across any node–guard junction)
 *   rail R = its fixed voltage.
 * Each junction is placed with its anode on one terminal and its cathode on another; its
 * bias is V(anode) − V(cathode) (positive = forward) and its current I(bias) flows from
 * anode to cathode. The current *leaving the node* through it is +I when the anode is on the
 * node and −I when the cathode is. The net node current is the signed sum; it is what the
 * source must supply, and with the source resistance R_s it makes the error V_err = I·R_s.
 *
 * A junction between the guard and a rail does not touch the node, and a junction with both
 * ends on one terminal carries nothing: both are refused. This module holds the network's
 * description and these rules; evaluation is in node-evaluate.ts.
 */
import type { JunctionModel } from './model';

/** Terminal names: the node itself, the guard, or a rail by its name. */
export type Terminal = string;
export const NODE = 'node';
export const GUARD = 'guard';

/** Rail names: a letter, then letters, digits, _, + or − (at most 16 characters). */
export const RAIL_NAME = /^[A-Za-z][A-Za-z0-9_+-]{0,15}$/;
export const MAX_RAILS = 8;
export const MAX_POSITIONS = 8;

/** The fixed part of a protected node. Voltages in V, temperatures in °C. */
export interface NodeNetwork {
	rails: Readonly<Record<string, number>>;
	/** Guard offset [V] (guard = signal + offset); absent when the node has no guard. */
	guardOffsetV?: number;
	/** [low, high] signal voltage [V]. */
	signalRangeV: readonly [number, number];
	/** [cold, hot] ends [°C] (equal for one temperature). */
	temperatureRangeC: readonly [number, number];
}

/** Where one junction sits: anode and cathode terminals. */
export interface Placement {
	anode: Terminal;
	cathode: Terminal;
}

/** A junction position with the models it may take (one per measured sample). */
export interface NodePosition extends Placement {
	samples: readonly JunctionModel[];
	/**
	 * One-sided tolerance factor k for this position's samples (tolerance.ts), when they are
	 * two or more measured samples of a part; absent: no statistical bound for the position.
	 */
	boundFactor?: number;
}

/** One problem with a network, naming the field as the API spells it. */
export interface NodeIssue {
	path: string;
	message: string;
}

/** The network or its placements cannot be evaluated; `issues` says where. */
export class NodeError extends RangeError {
	readonly issues: NodeIssue[];
	constructor(issues: NodeIssue[]) {
		super(`the protected node cannot be evaluated: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
		this.name = 'NodeError';
		this.issues = issues;
	}
}

function terminalIssue(net: NodeNetwork, t: Terminal, path: string): NodeIssue | null {
	if (t === NODE) return null;
	if (t === GUARD) return net.guardOffsetV === undefined ? { path, message: 'There is no guard: give the guard’s offset, or place the junction elsewhere.' } : null;
	if (!Object.prototype.hasOwnProperty.call(net.rails, t)) return { path, message: `No rail is called “${t}”.` };
	return null;
}

/**
 * Every problem with a network and its placements (empty when it can be evaluated):
 * rail names and voltages, signal and temperature ranges, terminals that exist, junctions
 * that touch the node and do not short a terminal to itself.
 */
export function networkIssues(net: NodeNetwork, placements: readonly Placement[]): NodeIssue[] {
	const issues: NodeIssue[] = [];
	const names = Object.keys(net.rails);
	if (names.length > MAX_RAILS) issues.push({ path: 'rails', message: `At most ${MAX_RAILS} rails.` });
	for (const name of names) {
		if (name === NODE || name === GUARD) issues.push({ path: `rails.${name}`, message: `“${name}” is the name of a terminal; call the rail something else.` });
		else if (!RAIL_NAME.test(name)) issues.push({ path: `rails.${name}`, message: 'A rail name is a letter followed by up to 15 letters, digits, _, + or −.' });
		if (!Number.isFinite(net.rails[name])) issues.push({ path: `rails.${name}`, message: 'A rail voltage must be a finite number of volts.' });
	}
	if (net.guardOffsetV !== undefined && !Number.isFinite(net.guardOffsetV)) issues.push({ path: 'guard.offsetV', message: 'The guard offset must be a finite number of volts.' });
	const [lo, hi] = net.signalRangeV;
	if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) issues.push({ path: 'signalRangeV', message: 'The signal range must be [low, high] in volts with low ≤ high.' });
	const [cold, hot] = net.temperatureRangeC;
	if (!Number.isFinite(cold) || !Number.isFinite(hot) || cold > hot || cold <= -273.15)
		issues.push({ path: 'temperatureRangeC', message: 'The temperature range must be [cold, hot] in °C above absolute zero.' });
	if (placements.length === 0) issues.push({ path: 'junctions', message: 'Place at least one junction.' });
	if (placements.length > MAX_POSITIONS) issues.push({ path: 'junctions', message: `At most ${MAX_POSITIONS} junctions.` });
	placements.forEach((p, i) => {
		const a = terminalIssue(net, p.anode, `junctions.${i}.anode`);
		const c = terminalIssue(net, p.cathode, `junctions.${i}.cathode`);
		if (a) issues.push(a);
		if (c) issues.push(c);
		if (p.anode === p.cathode) issues.push({ path: `junctions.${i}`, message: 'Anode and cathode are on the same terminal: the junction carries nothing.' });
		else if (p.anode !== NODE && p.cathode !== NODE)
			issues.push({ path: `junctions.${i}`, message: 'The junction does not touch the node, so it draws nothing from it: put the anode or the cathode on the node.' });
	});
	return issues;
}

/** @throws NodeError listing every problem (see `networkIssues`). */
export function checkNetwork(net: NodeNetwork, placements: readonly Placement[]): void {
	const issues = networkIssues(net, placements);
	if (issues.length) throw new NodeError(issues);
}

/**
 * Potential [V] of a terminal at a signal voltage (file header). `nodeV` moves the node away
 * from the signal (a fault drives it); the guard keeps following the signal.
 */
export function terminalVoltage(net: NodeNetwork, t: Terminal, signalV: number, nodeV = signalV): number {
	if (t === NODE) return nodeV;
	if (t === GUARD) return signalV + (net.guardOffsetV ?? 0);
	return net.rails[t];
}

/**
 * Bias [V] of a placed junction at a signal voltage: V(anode) − V(cathode), positive = forward
 * (`nodeV` as in `terminalVoltage`).
 */
export function biasAt(net: NodeNetwork, p: Placement, signalV: number, nodeV = signalV): number {
	return terminalVoltage(net, p.anode, signalV, nodeV) - terminalVoltage(net, p.cathode, signalV, nodeV);
}

/** +1 when the junction's current leaves the node (anode on the node), −1 when it enters it. */
export function leavingSign(p: Placement): 1 | -1 {
	return p.anode === NODE ? 1 : -1;
}

/**
 * [lowest, highest] bias [V] a placed junction sees over the signal range. The bias is
 * linear in the signal (slope 1, −1 or 0), so the ends of the range give both.
 */
export function biasRange(net: NodeNetwork, p: Placement): [number, number] {
	const a = biasAt(net, p, net.signalRangeV[0]);
	const b = biasAt(net, p, net.signalRangeV[1]);
	return [Math.min(a, b), Math.max(a, b)];
}

/** The terminal at the other end of a placed junction from the node. */
export function farTerminal(p: Placement): Terminal {
	return p.anode === NODE ? p.cathode : p.anode;
}
