import { describe, expect, it } from 'vitest';
import { SI_2019, celsiusToKelvin } from './constants';
import { createModel, type JunctionModel, type JunctionModelInput } from './model';
import { diodeCurrent } from './shockley';
import { NodeCircuit } from './node-evaluate';
import { NODE_PRESETS } from './node-presets';
import { evenGrid } from './maximize';
import type { NodeNetwork, NodePosition, Placement } from './node';
import { expectRelClose } from './test-helpers';
import { toleranceFactor } from './tolerance';

const { k, q } = SI_2019;

/**
 * Independent reference for one junction: the SPICE temperature law written out here,
 *   IS(T) = IS·(T/Tnom)^(XTI/N)·exp((T/Tnom − 1)·EG/(N·k·T/q)),  RSH(T) = RSH/f^((T − Tnom)/10 K),
 * and the Shockley current with a shunt, closed form for RS = 0 and otherwise the implicit
 * I = IS(T)·(exp((V − I·RS)/(N·Vt)) − 1) + (V − I·RS)/RSH(T) solved by plain bisection.
 */
function referenceCurrent(m: JunctionModel, v: number, tC: number): number {
	const T = tC + 273.15;
	const Tn = m.TNOM + 273.15;
	const vt = (k * T) / q;
	const is = m.IS * (T / Tn) ** (m.XTI / m.N) * Math.exp(((T / Tn - 1) * m.EG) / (m.N * vt));
	const g = m.RSH === undefined ? 0 : 1 / (m.RSH / m.shuntFactorPer10K ** ((tC - m.TNOM) / 10));
	const junction = (vd: number) => is * Math.expm1(vd / (m.N * vt)) + vd * g;
	if (m.RS === 0) return junction(v);
	let lo = Math.min(0, junction(v)) - 1e-30;
	let hi = Math.max(0, junction(v)) + 1e-30;
	for (let i = 0; i < 400; i++) {
		const mid = 0.5 * (lo + hi);
		if (mid - junction(v - mid * m.RS) > 0) hi = mid;
		else lo = mid;
	}
	return 0.5 * (lo + hi);
}

/** The node's potentials written out independently of node.ts. */
function referenceNet(net: NodeNetwork, placed: { at: Placement; model: JunctionModel }[], v: number, tC: number): number {
	const pot = (t: string) => (t === 'node' ? v : t === 'guard' ? v + (net.guardOffsetV ?? 0) : net.rails[t]);
	return placed.reduce((sum, { at, model }) => {
		const i = referenceCurrent(model, pot(at.anode) - pot(at.cathode), tC);
		return sum + (at.anode === 'node' ? i : -i);
	}, 0);
}

const silicon = (p: JunctionModelInput) => createModel(p);

describe('net node current', () => {
	const cases: { name: string; net: NodeNetwork; placed: { at: Placement; model: JunctionModel }[] }[] = [
		{
			name: 'a pair to ±5 V rails, unequal parts with shunts',
			net: { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] },
			placed: [
				{ at: { anode: 'node', cathode: 'VPOS' }, model: silicon({ IS: 2e-15, N: 1.02, RSH: 3e12 }) },
				{ at: { anode: 'VNEG', cathode: 'node' }, model: silicon({ IS: 7e-15, N: 1.1, RSH: 8e11, shuntFactorPer10K: 1.8 }) }
			]
		},
		{
			name: 'a back-to-back pair to a guard with a 2 mV offset, with series resistance',
			net: { rails: {}, guardOffsetV: 2e-3, signalRangeV: [-1, 1], temperatureRangeC: [-40, 85] },
			placed: [
				{ at: { anode: 'node', cathode: 'guard' }, model: silicon({ IS: 4e-12, N: 1.3, RS: 20 }) },
				{ at: { anode: 'guard', cathode: 'node' }, model: silicon({ IS: 1e-12, N: 1.05, RS: 5, RSH: 1e11 }) }
			]
		},
		{
			name: 'one clamp to a reference and one to a rail, a metal–semiconductor part among them',
			net: { rails: { REF: 0, VCC: 3.3 }, signalRangeV: [0.05, 2], temperatureRangeC: [25, 25] },
			placed: [
				{ at: { anode: 'REF', cathode: 'node' }, model: createModel({ IS: 5e-9, N: 1.04 }, 'metal-semiconductor') },
				{ at: { anode: 'node', cathode: 'VCC' }, model: silicon({ IS: 3e-14, N: 1.9, RSH: 1e10 }) }
			]
		}
	];

	// Closed form per junction, summed in the test (referenceNet), against the engine's curve.
	for (const c of cases)
		it(`equals an independent per-junction computation within 1e-6 relative: ${c.name}`, () => {
			const circuit = new NodeCircuit(c.net, c.placed.map(({ at, model }) => ({ ...at, samples: [model] })));
			const ev = circuit.evaluate(41);
			for (const end of [0, 1] as const) {
				const tC = c.net.temperatureRangeC[end];
				ev.signalV.forEach((v, i) => {
					const expected = referenceNet(c.net, c.placed, v, tC);
					expectRelClose(ev.typicalA[end][i], expected, 1e-6, `${tC} °C, ${v} V`);
					// One sample per position: the worst assignment is that one.
					expectRelClose(ev.worstA[end][i], expected, 1e-6, `${tC} °C, ${v} V (worst)`);
				});
			}
		});

	it('puts the worst point within 1 % of the largest |net current| on a dense grid, ends included', () => {
		for (const c of cases) {
			const circuit = new NodeCircuit(c.net, c.placed.map(({ at, model }) => ({ ...at, samples: [model] })));
			const ev = circuit.evaluate();
			let truth = 0;
			for (const tC of new Set(c.net.temperatureRangeC))
				for (const v of evenGrid(c.net.signalRangeV[0], c.net.signalRangeV[1], 20001)) truth = Math.max(truth, Math.abs(referenceNet(c.net, c.placed, v, tC)));
			expect(Math.abs(ev.worst.netCurrentA)).toBeGreaterThanOrEqual(truth * 0.99);
			expect(Math.abs(ev.worst.netCurrentA)).toBeLessThanOrEqual(truth * (1 + 1e-6));
		}
	});

	// A guard pair: node→guard sees −offset, guard→node +offset, so the current leaving the node
	// is IS·(e^(−x) − 1) − IS·(e^(x) − 1) = −2·IS·sinh(x), x = offset/(N·Vt): the two add.
	it('gives −2·IS·sinh(offset/(N·Vt)) for a matched back-to-back pair to the guard', () => {
		const m = silicon({ IS: 1e-12, N: 1 });
		const net: NodeNetwork = { rails: {}, guardOffsetV: 1e-3, signalRangeV: [-1, 1], temperatureRangeC: [25, 25] };
		const ev = new NodeCircuit(net, NODE_PRESETS['guard-pair'].junctions.map((j) => ({ ...j, samples: [m] }))).evaluate(11);
		const vt = (k * celsiusToKelvin(25)) / q;
		const is = diodeCurrent(m, -50, 25) * -1;
		for (const i of ev.typicalA[1]) expectRelClose(i, -2 * is * Math.sinh(1e-3 / vt), 1e-9);
	});
});

describe('cancellation and the worst sample assignment', () => {
	it('cancels in a matched pair to symmetric rails: zero at mid-signal, far below one junction elsewhere', () => {
		const m = silicon({ IS: 1e-14, N: 1 });
		const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [25, 85] };
		const circuit = new NodeCircuit(net, NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, samples: [m] })));
		const one = Math.abs(diodeCurrent(m, -3, 85));
		expect(circuit.point(0, 1).typicalA).toBe(0);
		const ev = circuit.evaluate();
		// Both junctions sit on the −IS plateau: what is left is IS·e^(−3 V/Vt), under 1e-50 of IS.
		expect(Math.abs(ev.worst.netCurrentA)).toBeLessThan(one * 1e-12);
	});

	it('with shunts, a matched rail pair leaves 2·V/RSH, the shunts not cancelling', () => {
		const m = silicon({ IS: 1e-15, N: 1, RSH: 1e12, TNOM: 25 });
		const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [25, 25] };
		const circuit = new NodeCircuit(net, NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, samples: [m] })));
		expectRelClose(circuit.point(1.5, 1).typicalA, (2 * 1.5) / 1e12, 1e-9);
		const ev = circuit.evaluate();
		expect(Math.abs(ev.worst.signalV)).toBe(2);
	});

	// Brute force: every assignment of samples to positions, the net current summed, the
	// largest magnitude kept; against the engine's separable rule at the same points.
	it('finds the same worst assignment as brute force over all sample assignments', () => {
		const lot = (base: number, spread: number[]) => spread.map((f, i) => silicon({ IS: base * f, N: 1 + 0.03 * i, RSH: 1e12 / f }));
		const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, guardOffsetV: 3e-3, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };
		const positions: NodePosition[] = [
			{ anode: 'node', cathode: 'VPOS', samples: lot(1e-14, [1, 3, 0.4]) },
			{ anode: 'VNEG', cathode: 'node', samples: lot(2e-14, [1, 0.2, 5, 1.5]) },
			{ anode: 'node', cathode: 'guard', samples: lot(1e-12, [1, 2]) }
		];
		const circuit = new NodeCircuit(net, positions);
		for (const end of [0, 1] as const)
			for (const v of [-2, -0.7, 0, 1.3, 2]) {
				const tC = net.temperatureRangeC[end];
				let best = 0;
				let bestAssignment: number[] = [];
				for (let a = 0; a < 3; a++)
					for (let b = 0; b < 4; b++)
						for (let c = 0; c < 2; c++) {
							const placed = [positions[0].samples[a], positions[1].samples[b], positions[2].samples[c]].map((model, p) => ({ at: positions[p], model }));
							const net_ = referenceNet(net, placed, v, tC);
							if (Math.abs(net_) > Math.abs(best)) {
								best = net_;
								bestAssignment = [a, b, c];
							}
						}
				const pt = circuit.point(v, end);
				expectRelClose(pt.worstA, best, 1e-6, `${tC} °C, ${v} V`);
				expect(circuit.assignment(v, end, pt.worstA === pt.highA ? 'high' : 'low').samples).toEqual(bestAssignment);
			}
		const ev = circuit.evaluate();
		expect(ev.worst.samples).toHaveLength(3);
		expect(Math.abs(ev.worst.netCurrentA)).toBeGreaterThanOrEqual(Math.abs(ev.typical.netCurrentA));
	});

	it('takes the median sample at every position as typical', () => {
		const samples = [1, 4, 2].map((f) => silicon({ IS: 1e-14 * f }));
		const net: NodeNetwork = { rails: { VPOS: 5 }, signalRangeV: [0, 1], temperatureRangeC: [25, 25] };
		const circuit = new NodeCircuit(net, [{ anode: 'node', cathode: 'VPOS', samples }]);
		expectRelClose(circuit.point(0.5, 0).typicalA, diodeCurrent(samples[2], -4.5, 25), 1e-12);
		expectRelClose(circuit.point(0.5, 0).worstA, diodeCurrent(samples[1], -4.5, 25), 1e-12);
	});
});

describe('the statistical bound of the net current', () => {
	const lot = (base: number, spread: number[]) => spread.map((f) => silicon({ IS: base * f, N: 1.02, RSH: 2e12 / f }));
	const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };
	const upper = lot(1e-14, [1, 3, 0.4]);
	const lower = lot(2e-14, [1, 0.2, 5, 1.5]);
	const k3 = toleranceFactor(3, 0.95, 0.9);
	const k4 = toleranceFactor(4, 0.95, 0.9);

	/** exp(ȳ ± k·s) over y = ln|I| of the samples, written out. */
	const limits = (currents: number[], k: number) => {
		const y = currents.map((i) => Math.log(Math.abs(i)));
		const mean = y.reduce((a, b) => a + b, 0) / y.length;
		const sd = Math.sqrt(y.reduce((a, b) => a + (b - mean) ** 2, 0) / (y.length - 1));
		return { hi: Math.exp(mean + k * sd), lo: Math.exp(mean - k * sd) };
	};

	it('stacks each position’s tolerance limits the way that adds to the node’s current', () => {
		const circuit = new NodeCircuit(net, [
			{ anode: 'node', cathode: 'VPOS', samples: upper, boundFactor: k3 },
			{ anode: 'VNEG', cathode: 'node', samples: lower, boundFactor: k4 }
		]);
		for (const end of [0, 1] as const)
			for (const v of [-2, -0.5, 1, 2]) {
				const tC = net.temperatureRangeC[end];
				// Upper clamp, reverse-biased: current into its cathode, so it draws current into the node (negative).
				const u = limits(upper.map((m) => referenceCurrent(m, v - 5, tC)), k3);
				// Lower clamp, reverse-biased: its current leaves the node (positive).
				const l = limits(lower.map((m) => referenceCurrent(m, -5 - v, tC)), k4);
				const high = l.hi - u.lo;
				const low = l.lo - u.hi;
				const expected = Math.abs(high) >= Math.abs(low) ? high : low;
				expectRelClose(circuit.point(v, end).boundA, expected, 1e-6, `${tC} °C, ${v} V`);
			}
		const ev = circuit.evaluate();
		expect(ev.bound).not.toBeNull();
		expectRelClose(Math.abs(ev.bound!.netCurrentA), Math.max(...[0, 1].flatMap((e) => Array.from(ev.boundA[e], Math.abs))), 1e-9);
	});

	it('keeps the extreme samples for a position without a factor, and has no bound when none has one', () => {
		const mixed = new NodeCircuit(net, [
			{ anode: 'node', cathode: 'VPOS', samples: upper },
			{ anode: 'VNEG', cathode: 'node', samples: lower, boundFactor: k4 }
		]);
		const v = 1;
		const worstUpper = Math.min(...upper.map((m) => Math.abs(referenceCurrent(m, v - 5, 70))));
		const l = limits(lower.map((m) => referenceCurrent(m, -5 - v, 70)), k4);
		expectRelClose(mixed.point(v, 1).boundA, l.hi - worstUpper, 1e-6);
		const none = new NodeCircuit(net, [
			{ anode: 'node', cathode: 'VPOS', samples: upper },
			{ anode: 'VNEG', cathode: 'node', samples: lower }
		]);
		const ev = none.evaluate(11);
		expect(ev.bound).toBeNull();
		expect(ev.noise.bound).toBeNull();
		expect(Number.isNaN(ev.boundA[1][0])).toBe(true);
	});

	it('bounds the noise power position by position, the powers added', () => {
		const circuit = new NodeCircuit(net, [
			{ anode: 'node', cathode: 'VPOS', samples: upper, boundFactor: k3 },
			{ anode: 'VNEG', cathode: 'node', samples: lower, boundFactor: k4 }
		]);
		const v = -2;
		const T = celsiusToKelvin(70);
		const vt = (k * T) / q;
		// RS = 0: the junction voltage is the bias; 2q·(I_d + 2·IS) + 4kT/RSH per sample.
		const power = (m: JunctionModel, bias: number) => {
			const is = -referenceCurrent({ ...m, RSH: undefined }, -50, 70);
			return 2 * q * (is * Math.expm1(bias / (m.N * vt)) + 2 * is) + (4 * k * T) / (m.RSH! / 2 ** ((70 - m.TNOM) / 10));
		};
		const expected = limits(upper.map((m) => power(m, v - 5)), k3).hi + limits(lower.map((m) => power(m, -5 - v)), k4).hi;
		expectRelClose(circuit.point(v, 1).noiseBound, expected, 1e-6);
	});
});

describe('node noise', () => {
	it('adds the positions’ noise powers and reports where the total is largest', () => {
		const a = silicon({ IS: 1e-13, N: 1, RSH: 1e11 });
		const b = silicon({ IS: 4e-13, N: 1.4 });
		const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };
		const circuit = new NodeCircuit(net, [
			{ anode: 'node', cathode: 'VPOS', samples: [a] },
			{ anode: 'VNEG', cathode: 'node', samples: [b] }
		]);
		const ev = circuit.evaluate();
		const T = celsiusToKelvin(ev.noise.worst.temperatureC);
		const v = ev.noise.worst.signalV;
		const tC = ev.noise.worst.temperatureC;
		// Independent: each junction's 2q·(I + 2·IS) + 4kT/RSH, at its own bias (RS = 0, so V_j = bias).
		const one = (m: JunctionModel, bias: number) => {
			const vt = (k * T) / q;
			const is = referenceCurrent({ ...m, RSH: undefined }, -50, tC) * -1;
			const g = m.RSH === undefined ? 0 : 1 / (m.RSH / 2 ** ((tC - m.TNOM) / 10));
			return 2 * q * (is * Math.expm1(bias / (m.N * vt)) + 2 * is) + 4 * k * T * g;
		};
		expectRelClose(ev.noise.worst.densityA_rtHz ** 2, one(a, v - 5) + one(b, -5 - v), 1e-9);
		expect(ev.noise.worst.temperatureC).toBe(70);
		expect(ev.noise.approximate).toBe(true);
	});
});
