// POST /api/v1/node: a protected node evaluated over HTTP, with inline models and with
// catalogue parts (all their samples), against the engine's closed forms written out here,
// and the error shape for nodes that cannot be evaluated.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { SI_2019 } from '$lib/junction';
import type { NodeResponse } from '$lib/schemas/node';
import type { RankResponse } from '$lib/schemas/rank';
import { api, unique } from './helpers';
import { createParts, deleteParts } from './rank-fixtures';

const { k, q } = SI_2019;
/** IS(T) by the SPICE law (TNOM 27 °C, EG 1.11 eV, XTI 3), written out here. */
function isAt(IS: number, N: number, tC: number) {
	const T = tC + 273.15;
	const r = T / 300.15;
	return IS * r ** (3 / N) * Math.exp(((r - 1) * 1.11) / ((N * k * T) / q));
}
/** Shockley current with RS = 0 and no shunt. */
const shockley = (IS: number, N: number, v: number, tC: number) => isAt(IS, N, tC) * Math.expm1(v / ((N * k * (tC + 273.15)) / q));

const railPair = {
	rails: { VPOS: 5, VNEG: -5 },
	signalRangeV: [-2, 2],
	temperatureRangeC: [0, 70],
	sourceResistanceOhm: 1e9,
	faultCurrentA: 0.01
};

async function node(body: unknown) {
	return api<NodeResponse>('POST', '/api/v1/node', { as: 'designer', json: body });
}
type Refusal = { error: { code: string; message: string; issues: { path: string; message: string }[] } };
async function refused(body: unknown) {
	return api<Refusal>('POST', '/api/v1/node', { as: 'designer', json: body });
}

describe('POST /api/v1/node with inline models', () => {
	test('answers the worst and typical net current, error voltage, noise, fault and curve', async () => {
		const r = await node({
			...railPair,
			gridPoints: 21,
			junctions: [
				{ model: { IS: 2e-14, N: 1 }, anode: 'node', cathode: 'VPOS', label: 'D1' },
				{ model: { IS: 5e-14, N: 1 }, anode: 'VNEG', cathode: 'node', label: 'D2' }
			]
		});
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		const b = r.body;
		expect(b.curve).toHaveLength(21);
		expect(b.curve[0].signalV).toBe(-2);
		expect(b.curve[20].signalV).toBe(2);
		// Each point: −I1(V − 5) ... written out: leaving = I(D1) − I(D2).
		for (const p of b.curve)
			for (const [end, tC] of [['cold', 0], ['hot', 70]] as const) {
				const expected = shockley(2e-14, 1, p.signalV - 5, tC) - shockley(5e-14, 1, -5 - p.signalV, tC);
				expect(Math.abs(p.netCurrentA[end] - expected)).toBeLessThanOrEqual(1e-6 * Math.abs(expected));
			}
		// The larger IS is on the lower clamp, which feeds current in: net ≈ IS2 − IS1 at the hot end.
		expect(b.worst.temperatureC).toBe(70);
		expect(b.worst.netCurrentA).toBeGreaterThan(0);
		expect(Math.abs(b.worst.netCurrentA - (isAt(5e-14, 1, 70) - isAt(2e-14, 1, 70)))).toBeLessThan(1e-6 * b.worst.netCurrentA);
		expect(b.errorVoltageV).toBeCloseTo(Math.abs(b.worst.netCurrentA) * 1e9, 20);
		expect(b.noise.approximate).toBe(false);
		expect(b.noise.note).toMatch(/approximation/);
		// Reverse-biased far beyond kT/q: 2q·IS per junction, the powers adding.
		expect(b.noise.densityA_rtHz ** 2 / (2 * q * (isAt(2e-14, 1, 70) + isAt(5e-14, 1, 70)))).toBeCloseTo(1, 6);
		expect(b.fault).toMatchObject({ direction: 'above', clampedTo: 'VPOS', opposite: { direction: 'below', clampedTo: 'VNEG' } });
		const vt = (k * 273.15) / q;
		expect(b.fault!.excursionV.cold!).toBeCloseTo(vt * Math.log(0.01 / isAt(2e-14, 1, 0) + 1), 6);
		expect(b.junctions.map((j) => [j.label, j.biasRangeV])).toEqual([
			['D1', [-7, -3]],
			['D2', [-7, -3]]
		]);
		expect(b.meetsLimits).toBe(true);
	});

	test('raises the limit flags a node fails, in words the engine owns', async () => {
		const r = await node({
			...railPair,
			maxNetCurrentA: 1e-18,
			maxExcursionV: 0.2,
			junctions: [
				{ model: { IS: 2e-14, N: 1 }, anode: 'node', cathode: 'VPOS' },
				{ model: { IS: 5e-14, N: 1 }, anode: 'VNEG', cathode: 'node' }
			]
		});
		expect(r.status).toBe(200);
		// Picoamps through 1 GΩ are millivolts, over a tenth of kT/q: the node moves off the signal.
		expect(r.body.flags).toEqual(['over-net-current-limit', 'excursion-over-limit', 'error-shifts-bias']);
		expect(r.body.meetsLimits).toBe(false);
	});
});

describe('POST /api/v1/node with catalogue parts', () => {
	const tag = unique('node');
	let ids: number[] = [];
	beforeAll(async () => {
		ids = await createParts([
			{ partNumber: `${tag}-P`, samples: [0.5, 1, 3].map((f) => ({ IS: 1e-14 * f, N: 1, TNOM: 27 })) }
		]);
		for (let i = 0; i < 100; i++) {
			const seen = await api<RankResponse>('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -1, temperatureC: 25, q: tag } });
			if (seen.body.evaluated === 1) return;
			await new Promise((res) => setTimeout(res, 100));
		}
		throw new Error('the model cache never saw the test part');
	});
	afterAll(async () => deleteParts(ids));

	test('takes the worst sample assignment: the leakiest unit feeding in, the tightest leaking out', async () => {
		const r = await node({ ...railPair, junctions: [{ id: ids[0], anode: 'node', cathode: 'VPOS' }, { id: ids[0], anode: 'VNEG', cathode: 'node' }] });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		// Net = I(D1) − I(D2) ≈ −IS_a + IS_b: largest with a = the 0.5× unit, b = the 3× unit.
		expect(r.body.worst.samples).toEqual([
			{ position: 0, sample: 0 },
			{ position: 1, sample: 2 }
		]);
		expect(r.body.worst.netCurrentA / ((3 - 0.5) * isAt(1e-14, 1, 70))).toBeCloseTo(1, 6);
		// Typical: the median unit in both places cancels to nothing beside that.
		expect(Math.abs(r.body.typical.netCurrentA)).toBeLessThan(1e-9 * r.body.worst.netCurrentA);
		expect(r.body.junctions[0]).toMatchObject({ id: ids[0], partNumber: `${tag}-P`, samples: 3 });
	});

	test('refuses a part the catalogue does not have, naming the junction', async () => {
		const r = await refused({ ...railPair, junctions: [{ id: 2_000_000_000, anode: 'node', cathode: 'VPOS' }] });
		expect(r.status).toBe(422);
		expect(r.body.error.issues[0].path).toBe('junctions.0.id');
	});
});

describe('POST /api/v1/node refuses what cannot be evaluated', () => {
	const m = { IS: 1e-14, N: 1 };
	const cases: [string, unknown, string][] = [
		['an unknown rail', { ...railPair, junctions: [{ model: m, anode: 'node', cathode: 'VCC' }] }, 'junctions.0.cathode'],
		['a guard that is not there', { ...railPair, junctions: [{ model: m, anode: 'node', cathode: 'guard' }] }, 'junctions.0.cathode'],
		['a junction off the node', { ...railPair, junctions: [{ model: m, anode: 'VNEG', cathode: 'VPOS' }] }, 'junctions.0'],
		['a candidate position', { ...railPair, junctions: [{ candidate: true, anode: 'node', cathode: 'VPOS' }] }, 'junctions.0.candidate'],
		['both a part and a model', { ...railPair, junctions: [{ id: 1, model: m, anode: 'node', cathode: 'VPOS' }] }, 'junctions.0'],
		['a reversed signal range', { ...railPair, signalRangeV: [2, -2], junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, 'signalRangeV'],
		['no temperature', { ...railPair, temperatureRangeC: undefined, junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, 'temperatureC'],
		['an error limit without a source resistance', { ...railPair, sourceResistanceOhm: undefined, allowedErrorV: 1e-3, junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, 'allowedErrorV'],
		['a rail called node', { ...railPair, rails: { node: 1 }, junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, 'rails.node'],
		['a grid too fine', { ...railPair, gridPoints: 5000, junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, 'gridPoints'],
		['an unknown field', { ...railPair, railz: {}, junctions: [{ model: m, anode: 'node', cathode: 'VPOS' }] }, '']
	];
	for (const [what, body, path] of cases)
		test(`400 for ${what}, naming ${path || 'the body'}`, async () => {
			const r = await refused(body);
			expect(r.status).toBe(400);
			expect(r.body.error.code).toBe('bad_request');
			expect(r.body.error.issues.map((i) => i.path)).toContain(path);
		});

});
