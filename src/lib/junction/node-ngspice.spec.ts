/**
 * A pair of clamps to ±5 V rails (the "pair to the rails" network) simulated by ngspice 39 in
 * a DC sweep of the node voltage, against the engine's net node current.
 *
 * Each clamp is written out as ngspice sees it: RS from the node to an inner point, the diode
 * and its shunt (RSH at that temperature, as a plain resistor) from the inner point to the
 * rail. The source holding the node reports the current it supplies, which is the current
 * leaving the node through the clamps, with ngspice's sign (into its + terminal) reversed.
 * GMIN is switched off: ngspice otherwise puts 1e-12 S across every junction, which at these
 * biases is picoamps; a second sweep with the default GMIN shows the difference is exactly
 * that conductance (and so negligible only where the junction currents dwarf it).
 * ngspice uses CODATA 2014 constants and, below −3·N·Vt, a cubic approximation of the reverse
 * current that differs from Shockley by IS·(3·N·Vt/(e·|V|))³, under 1e-6 of IS beyond −3 V.
 */
import { describe, expect, it } from 'vitest';
import { ngspiceAvailable, runNgspiceDc } from '../../../tests/reference/ngspice';
import { CODATA_2014 } from './constants';
import { createModel, type JunctionModel } from './model';
import { shuntResistanceAt } from './temperature';
import { emitModelCard } from './spice-card';
import { NodeCircuit } from './node-evaluate';
import { NODE_PRESETS } from './node-presets';
import type { NodeNetwork } from './node';
import { diodeCurrent } from './shockley';

const upper = createModel({ IS: 3e-12, N: 1.05, RS: 8, RSH: 2e10 });
const lower = createModel({ IS: 1.2e-11, N: 1.2, RS: 3, RSH: 6e9, shuntFactorPer10K: 1.6 });

function deck(tC: number): string {
	const clamp = (name: string, anode: string, cathode: string, m: JunctionModel) => [
		emitModelCard(`m${name}`, m, { forSimulator: true }),
		`rs${name} ${anode} i${name} ${m.RS}`,
		`d${name} i${name} ${cathode} m${name}`,
		`rsh${name} i${name} ${cathode} ${shuntResistanceAt(m, tC)}`
	];
	return [
		'vsig node 0 dc 0',
		'vpos vpos 0 dc 5',
		'vneg vneg 0 dc -5',
		...clamp('up', 'node', 'vpos', upper),
		// The lower clamp's anode is on the rail, so its RS sits on the rail side.
		...clamp('dn', 'vneg', 'node', lower),
		`.temp ${tC}`
	].join('\n');
}

describe('a rail pair against an ngspice DC sweep', () => {
	const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 85] };
	const circuit = new NodeCircuit(
		net,
		NODE_PRESETS['rail-pair'].junctions.map((j, i) => ({ ...j, samples: [i === 0 ? upper : lower] })),
		CODATA_2014
	);

	it('has ngspice at /usr/bin/ngspice', () => expect(ngspiceAvailable()).toBe(true));

	for (const end of [0, 1] as const) {
		const tC = net.temperatureRangeC[end];
		it(`agrees on the net node current across ±2 V at ${tC} °C with GMIN off`, () => {
			const sweep = runNgspiceDc({
				netlist: deck(tC),
				source: 'vsig',
				start: -2,
				stop: 2,
				step: 0.1,
				expression: 'i(vsig)',
				options: 'gmin=0 reltol=1e-10 abstol=1e-30 vntol=1e-15'
			});
			expect(sweep.length).toBe(41);
			for (const { x, y } of sweep) {
				const engine = circuit.point(x, end).typicalA;
				// The two clamps' currents set the scale of the rounding in the source's branch current.
				const scale = Math.abs(diodeCurrent(upper, x - 5, tC, CODATA_2014)) + Math.abs(diodeCurrent(lower, -5 - x, tC, CODATA_2014));
				expect(Math.abs(engine - -y), `${x} V: engine ${engine}, ngspice ${-y}`).toBeLessThanOrEqual(2e-6 * scale);
			}
		});
	}

	it('differs with the default GMIN by the 1e-12 S it puts across each junction', () => {
		const tC = 85;
		const sweep = runNgspiceDc({ netlist: deck(tC), source: 'vsig', start: -2, stop: 2, step: 0.5, expression: 'i(vsig)', options: 'reltol=1e-10 abstol=1e-30 vntol=1e-15' });
		for (const { x, y } of sweep) {
			// GMIN across the upper junction leaks (x − 5)·GMIN out of the node; across the lower, (−5 − x)·GMIN into it.
			const gmin = 1e-12 * (x - 5) - 1e-12 * (-5 - x);
			const engine = circuit.point(x, 1).typicalA;
			const tolerance = 2e-6 * (Math.abs(diodeCurrent(upper, x - 5, tC, CODATA_2014)) + Math.abs(diodeCurrent(lower, -5 - x, tC, CODATA_2014)));
			expect(Math.abs(engine + gmin - -y), `${x} V`).toBeLessThanOrEqual(tolerance);
			// Away from mid-signal GMIN's share is far above the rounding: not negligible at this scale.
			if (x !== 0) expect(Math.abs(engine - -y)).toBeGreaterThan(10 * tolerance);
		}
	});
});
