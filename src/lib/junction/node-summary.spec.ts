import { describe, expect, it } from 'vitest';
import { createModel } from './model';
import { NodeCircuit } from './node-evaluate';
import { NODE_PRESETS } from './node-presets';
import { summarizeNode } from './node-summary';
import { forwardVoltage } from './shockley';
import type { NodeNetwork } from './node';
import { expectRelClose } from './test-helpers';
import { toleranceFactor } from './tolerance';

const m = createModel({ IS: 1e-13, N: 1, RSH: 1e11 });
const railPair: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };
const circuit = () => new NodeCircuit(railPair, NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, samples: [m] })));

describe('a node summary', () => {
	it('turns the worst net current into an error voltage across the source resistance', () => {
		const s = summarizeNode(circuit(), { sourceResistanceOhm: 1e9 });
		expectRelClose(s.errorVoltageV!, Math.abs(s.evaluation.worst.netCurrentA) * 1e9, 1e-15);
		expect(summarizeNode(circuit()).errorVoltageV).toBeNull();
	});

	it('gives the fault excursion both ways at both ends, cold above hot', () => {
		const s = summarizeNode(circuit(), { faultCurrentA: 5e-3 });
		expect(s.fault!.direction).toBe('above');
		expect(s.oppositeFault!.direction).toBe('below');
		const [cold, hot] = s.fault!.worst.map((f) => f.excursionV!);
		expect(cold).toBeGreaterThan(hot);
		expectRelClose(hot, forwardVoltage(m, 5e-3, 70), 1e-6);
	});

	it('raises a limit flag for each limit exceeded and meets limits it is within', () => {
		const base = summarizeNode(circuit(), { sourceResistanceOhm: 1e9, faultCurrentA: 5e-3 });
		const worst = Math.abs(base.evaluation.worst.netCurrentA);
		const noise = base.evaluation.noise.worst.densityA_rtHz;
		const within = summarizeNode(circuit(), {
			sourceResistanceOhm: 1e9,
			faultCurrentA: 5e-3,
			limits: { maxNetCurrentA: worst * 1.01, maxNoiseA_rtHz: noise * 1.01, maxExcursionV: 1 }
		});
		expect(within.meetsLimits).toBe(true);
		const over = summarizeNode(circuit(), {
			sourceResistanceOhm: 1e9,
			faultCurrentA: 5e-3,
			limits: { allowedErrorV: worst * 1e9 * 0.99, maxNoiseA_rtHz: noise * 0.99, maxExcursionV: 0.5 }
		});
		expect(over.flags).toEqual(expect.arrayContaining(['over-net-current-limit', 'over-noise-limit', 'excursion-over-limit']));
		expect(over.meetsLimits).toBe(false);
	});

	it('says when nothing clamps the fault, and when the signal range turns a junction on', () => {
		const net: NodeNetwork = { rails: { REF: 0 }, signalRangeV: [-0.5, 2], temperatureRangeC: [25, 25] };
		const s = summarizeNode(new NodeCircuit(net, [{ anode: 'REF', cathode: 'node', samples: [m] }]), { faultCurrentA: 1e-3 });
		expect(s.flags).toEqual(['fault-unclamped', 'conducts-in-range']);
		expect(s.meetsLimits).toBe(false);
	});

	it('warns when the error voltage is large beside kT/q', () => {
		const s = summarizeNode(circuit(), { sourceResistanceOhm: 1e12 });
		expect(s.errorVoltageV!).toBeGreaterThan(2.6e-3);
		expect(s.flags).toContain('error-shifts-bias');
	});

	it('judges the limits on the basis: the bound where there is one, else the worst assignment', () => {
		const lot = [1, 2.5, 0.6].map((f) => createModel({ IS: 1e-13 * f, N: 1, RSH: 1e11 / f }));
		const k = toleranceFactor(3, 0.95, 0.9);
		const bounded = () => new NodeCircuit(railPair, NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, samples: lot, boundFactor: k })));
		const free = summarizeNode(bounded());
		const worst = Math.abs(free.evaluation.worst.netCurrentA);
		const bound = Math.abs(free.evaluation.bound!.netCurrentA);
		expect(bound).toBeGreaterThan(worst);
		const limits = { maxNetCurrentA: Math.sqrt(worst * bound) };
		expect(summarizeNode(bounded(), { limits }).flags).toContain('over-net-current-limit');
		expect(summarizeNode(bounded(), { limits, basis: 'worst' }).flags).not.toContain('over-net-current-limit');
		expect(summarizeNode(bounded(), { limits, basis: 'bound' }).judged).toMatchObject({ basis: 'bound', hasValue: true });
		// One sample per position: no bound, the worst assignment stands in and says so.
		const single = summarizeNode(circuit(), { limits: { maxNetCurrentA: 1 } });
		expect(single.judged).toMatchObject({ basis: 'bound', hasValue: false, netCurrentA: single.evaluation.worst.netCurrentA });
	});
});
