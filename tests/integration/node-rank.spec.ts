// POST /api/v1/node/rank: catalogue parts ranked in a protected node over HTTP, each item
// agreeing with POST /api/v1/node for that part in the candidate positions; the order rules;
// refusals naming the field. And the current-noise column and limit of POST /api/v1/rank.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { SI_2019 } from '$lib/junction';
import type { NodeResponse } from '$lib/schemas/node';
import type { NodeRankResponse } from '$lib/schemas/node-rank';
import type { RankResponse } from '$lib/schemas/rank';
import { api, unique } from './helpers';
import { createParts, deleteParts } from './rank-fixtures';

const tag = unique('noderank');
const railPair = {
	rails: { VPOS: 5, VNEG: -5 },
	signalRangeV: [-2, 2],
	temperatureRangeC: [0, 70],
	sourceResistanceOhm: 1e9,
	faultCurrentA: 0.01,
	q: tag,
	junctions: [
		{ candidate: true, anode: 'node', cathode: 'VPOS', label: 'upper' },
		{ candidate: true, anode: 'VNEG', cathode: 'node', label: 'lower' }
	]
};
const lot = (IS: number, spread: number[], extra: Record<string, number> = {}) => spread.map((f) => ({ IS: IS * f, N: 1.02, RS: 3, TNOM: 27, ...extra }));

let ids: number[] = [];
beforeAll(async () => {
	ids = await createParts([
		{ partNumber: `${tag}-TIGHT`, samples: lot(2e-15, [1, 1.5, 0.7]) },
		{ partNumber: `${tag}-LEAKY`, samples: lot(4e-11, [1, 2, 0.6]) },
		{ partNumber: `${tag}-SHUNT`, samples: lot(1e-15, [1, 1.3, 0.8], { RSH: 1e11 }) },
		{ partNumber: `${tag}-LOWV`, samples: lot(2e-15, [1, 1.2, 0.9]), ratedReverseV: 5 }
	]);
	for (let i = 0; i < 100; i++) {
		const seen = await api<RankResponse>('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -1, temperatureC: 25, q: tag, includeOverRating: true } });
		if (seen.body.evaluated === 4) return;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error('the model cache never saw the test parts');
});
afterAll(async () => deleteParts(ids));

async function rank(body: Record<string, unknown>) {
	return api<NodeRankResponse>('POST', '/api/v1/node/rank', { as: 'designer', json: { ...railPair, ...body } });
}

describe('POST /api/v1/node/rank', () => {
	test('lists the parts in order, each as POST /api/v1/node gives that part in both positions', async () => {
		const r = await rank({ basis: 'worst', withCurves: 2, gridPoints: 21 });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		const b = r.body;
		// The 5 V part is reverse-biased up to 7 V here: left out.
		expect(b).toMatchObject({ evaluated: 4, excludedOverRating: 1, reverseV: 7, basis: 'worst', by: 'net', coldC: 0, hotC: 70 });
		expect(b.items.map((i) => i.partNumber)).toEqual([`${tag}-TIGHT`, `${tag}-SHUNT`, `${tag}-LEAKY`]);
		for (const item of b.items) {
			const one = await api<NodeResponse>('POST', '/api/v1/node', {
				as: 'designer',
				json: { ...railPair, q: undefined, basis: 'worst', gridPoints: 21, junctions: railPair.junctions.map(({ candidate: _c, ...j }) => ({ ...j, id: item.id })) }
			});
			expect(one.status, JSON.stringify(one.body)).toBe(200);
			const near = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-6 * Math.abs(b));
			near(item.worst.netCurrentA, one.body.worst.netCurrentA);
			near(item.leakageA.typical, Math.abs(one.body.typical.netCurrentA));
			near(item.noiseA_rtHz.worst, one.body.noise.densityA_rtHz);
			near(item.excursionV!.cold!, one.body.fault!.excursionV.cold!);
			near(item.excursionV!.hot!, one.body.fault!.excursionV.hot!);
			near(item.errorVoltageV!, one.body.errorVoltageV!);
			expect(item.forwardDropV).toEqual({ cold: item.excursionV!.cold, hot: item.excursionV!.hot, worst: Math.max(item.excursionV!.cold!, item.excursionV!.hot!) });
			expect(item.reverseMarginV).toBe(30 - 7);
			expect(item.samples).toBe(3);
		}
		// Curves for the first two, on the request's grid, at both ends.
		expect(b.items[0].curve).toHaveLength(21);
		expect(b.items[1].curve![20]).toMatchObject({ signalV: 2 });
		expect(b.items[2].curve).toBeUndefined();
	});

	test('judges on the bound by default, holds the limits, and lists a part over its rating when asked', async () => {
		const free = await rank({});
		expect(free.body.basis).toBe('bound');
		for (const item of free.body.items) expect(item.leakageA.bound).toBeGreaterThan(item.leakageA.worst);
		const cut = Math.sqrt(free.body.items[0].leakageA.bound! * free.body.items[1].leakageA.bound!);
		const limited = await rank({ maxNetCurrentA: cut, includeOverRating: true });
		expect(limited.body.leakageBudgetA).toBe(cut);
		const [first, ...rest] = limited.body.items;
		expect(first.meetsLimits).toBe(true);
		for (const item of rest) expect(item.meetsLimits).toBe(false);
		const lowV = rest.find((i) => i.partNumber === `${tag}-LOWV`)!;
		expect(lowV.flags).toContain('over-reverse-rating');
		expect(lowV.reverseMarginV).toBe(5 - 7);
		// A 1 mA fault limit on the forward rating: none is rated, so none is flagged for it.
		expect(limited.body.items.some((i) => i.flags.includes('over-forward-rating'))).toBe(false);
	});

	test('ranks by noise on request', async () => {
		const r = await rank({ by: 'noise', basis: 'typical' });
		expect(r.body.by).toBe('noise');
		const noise = r.body.items.map((i) => i.noiseA_rtHz.typical);
		expect(noise).toEqual([...noise].sort((a, b) => a - b));
	});

	const refusals: [string, Record<string, unknown>, string][] = [
		['no candidate position', { junctions: [{ model: { IS: 1e-14, N: 1 }, anode: 'node', cathode: 'VPOS' }] }, 'junctions'],
		['a candidate that names a part', { junctions: [{ candidate: true, id: 1, anode: 'node', cathode: 'VPOS' }] }, 'junctions.0'],
		['an unknown order', { by: 'price' }, 'by'],
		['too many curves', { withCurves: 50 }, 'withCurves'],
		['a coverage out of range', { coverage: 1.5 }, 'coverage']
	];
	for (const [what, body, path] of refusals)
		test(`400 for ${what}, naming ${path}`, async () => {
			const r = await api<{ error: { issues: { path: string }[] } }>('POST', '/api/v1/node/rank', { as: 'designer', json: { ...railPair, ...body } });
			expect(r.status).toBe(400);
			expect(r.body.error.issues.map((i) => i.path)).toContain(path);
		});
});

describe('current noise in POST /api/v1/rank', () => {
	test('gives each item its noise density, and a noise limit puts the noisy parts after the quiet', async () => {
		const op = { biasV: -5, temperatureRangeC: [0, 70], q: tag };
		const r = await api<RankResponse>('POST', '/api/v1/rank', { as: 'designer', json: op });
		expect(r.status).toBe(200);
		const leaky = r.body.items.find((i) => i.partNumber === `${tag}-LEAKY`)!;
		// Deep reverse: the shot noise of the saturation current, 2q·IS(70 °C), over the samples.
		expect(leaky.noiseA_rtHz.worst).toBeGreaterThan(leaky.noiseA_rtHz.typical);
		expect(leaky.noiseA_rtHz.typical ** 2 / (2 * SI_2019.q * leaky.leakageA.typical)).toBeCloseTo(1, 3);
		const limited = await api<RankResponse>('POST', '/api/v1/rank', { as: 'designer', json: { ...op, maxNoiseA_rtHz: leaky.noiseA_rtHz.typical / 2 } });
		expect(limited.body.items.at(-1)!.partNumber).toBe(`${tag}-LEAKY`);
		expect(limited.body.items.at(-1)!.flags).toContain('over-noise-limit');
	});
});
