import { describe, expect, it } from 'vitest';
import { biasAt, biasRange, checkNetwork, leavingSign, networkIssues, NodeError, terminalVoltage, type NodeNetwork } from './node';
import { NODE_PRESETS, NODE_PRESET_KEYS } from './node-presets';

const net: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, guardOffsetV: 2e-3, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };

describe('the protected node’s potentials', () => {
	it('holds the node at the signal, the guard at signal + offset and rails fixed', () => {
		expect(terminalVoltage(net, 'node', 1.5)).toBe(1.5);
		expect(terminalVoltage(net, 'guard', 1.5)).toBe(1.502);
		expect(terminalVoltage(net, 'VNEG', 1.5)).toBe(-5);
		expect(terminalVoltage(net, 'node', 1.5, 7)).toBe(7);
		expect(terminalVoltage(net, 'guard', 1.5, 7)).toBe(1.502);
	});

	const cases = [
		{ at: { anode: 'node', cathode: 'VPOS' }, v: 2, bias: -3, sign: 1, range: [-7, -3] },
		{ at: { anode: 'VNEG', cathode: 'node' }, v: 2, bias: -7, sign: -1, range: [-7, -3] },
		{ at: { anode: 'node', cathode: 'guard' }, v: -1, bias: -2e-3, sign: 1, range: [-2e-3, -2e-3] },
		{ at: { anode: 'guard', cathode: 'node' }, v: 0, bias: 2e-3, sign: -1, range: [2e-3, 2e-3] }
	];
	for (const c of cases)
		it(`biases ${c.at.anode}→${c.at.cathode} as V(anode) − V(cathode)`, () => {
			expect(biasAt(net, c.at, c.v)).toBeCloseTo(c.bias, 12);
			expect(leavingSign(c.at)).toBe(c.sign);
			const [lo, hi] = biasRange(net, c.at);
			expect(lo).toBeCloseTo(c.range[0], 12);
			expect(hi).toBeCloseTo(c.range[1], 12);
		});
});

describe('what a node may hold', () => {
	it('accepts every preset as it stands', () => {
		for (const key of NODE_PRESET_KEYS) {
			const p = NODE_PRESETS[key];
			expect(() => checkNetwork({ rails: p.rails, guardOffsetV: p.guardOffsetV, signalRangeV: p.signalRangeV, temperatureRangeC: p.temperatureRangeC }, p.junctions)).not.toThrow();
		}
	});

	it('names every problem with its field', () => {
		const bad: NodeNetwork = { rails: { node: 1, '9V': 9, VCC: Number.NaN }, signalRangeV: [2, -2], temperatureRangeC: [80, 20] };
		const issues = networkIssues(bad, [
			{ anode: 'node', cathode: 'guard' },
			{ anode: 'VEE', cathode: 'node' },
			{ anode: 'node', cathode: 'node' },
			{ anode: 'VCC', cathode: '9V' }
		]);
		expect(issues.map((i) => i.path)).toEqual([
			'rails.node',
			'rails.9V',
			'rails.VCC',
			'signalRangeV',
			'temperatureRangeC',
			'junctions.0.cathode',
			'junctions.1.anode',
			'junctions.2',
			'junctions.3'
		]);
		expect(issues[5].message).toMatch(/no guard/i);
		expect(issues[6].message).toMatch(/No rail is called “VEE”/);
		expect(issues[8].message).toMatch(/does not touch the node/);
	});

	it('needs at least one junction and refuses too many', () => {
		expect(networkIssues(net, []).map((i) => i.path)).toEqual(['junctions']);
		expect(networkIssues(net, Array.from({ length: 9 }, () => ({ anode: 'node', cathode: 'VPOS' }))).map((i) => i.path)).toEqual(['junctions']);
		expect(() => checkNetwork(net, [])).toThrow(NodeError);
	});
});
