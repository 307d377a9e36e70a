// The worst case a designer can trust, over HTTP: the ranking basis and the statistical
// bound, the order rules with crafted catalogues, the bad-input messages, and every
// exported SPICE block simulated in ngspice 39 at test time against /api/v1/predict and
// the rank item.
//
// Tolerances: 1e-4 relative (ngspice compiles in CODATA 2014 k and q, ~6e-8 from the exact
// SI values the app uses; cards carry 7 significant digits); below −3·N·Vt ngspice replaces
// Shockley with a cubic approximation up to ~0.4 % away, so reverse leakage there is
// compared within 0.5 %.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { celsiusToKelvin, CODATA_2014, thermalVoltage, toleranceFactor, logNormalUpperBound } from '$lib/junction';
import type { StoredModel } from '$lib/server/db/schema';
import type { RankItem, RankResponse } from '$lib/schemas/rank';
import { blockCurrents } from '../reference/ngspice';
import { api, browse, unique } from './helpers';
import { createParts, deleteParts, rank, seen, type TestPart } from './rank-fixtures';

const created: number[] = [];
afterAll(async () => deleteParts(created));

const rel = (a: number, b: number) => (a === b ? 0 : Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b)));
const silicon = (IS: number, extra: Partial<StoredModel> = {}): StoredModel => ({ IS, N: 1.05, RS: 1, TNOM: 27, ...extra });
const op = { biasV: -5, temperatureRangeC: [0, 85] as [number, number] };

describe('basis, bound and order over HTTP', () => {
	const tag = unique('tb');
	const parts: TestPart[] = [
		// Wide spread over three samples: low typical, large bound.
		{ partNumber: `${tag}-wide`, samples: [0.2, 1, 5].map((f) => silicon(1e-14 * f)), sampleUnits: ['W1', 'W2', 'W3'] },
		// Tight spread, leakier typical: the smaller bound.
		{ partNumber: `${tag}-tight`, samples: [0.98, 1, 1.02].map((f) => silicon(1e-13 * f)), sampleUnits: ['T1', 'T2', 'T3'] },
		// One sample, the least leakage of the measured parts: no bound.
		{ partNumber: `${tag}-one`, samples: [silicon(1e-16)], sampleUnits: ['O1'] },
		// A datasheet model with the lowest IS of all, never measured.
		{
			partNumber: `${tag}-given`,
			samples: [silicon(1e-18)],
			measured: { minCurrentA: null, temperaturesC: [], reverseMeasured: false, worstRmsResidualV: null }
		},
		// Rated for 10 mA forward.
		{ partNumber: `${tag}-small`, samples: [0.9, 1, 1.1].map((f) => silicon(1e-15 * f)), ratedForwardA: 0.01 }
	];

	beforeAll(async () => {
		created.push(...(await createParts(parts)));
		await seen(tag, parts.length);
	});

	const names = (r: RankResponse) => r.items.map((i) => i.partNumber.slice(tag.length + 1));

	test('by default ranks on the bound: measured with a bound, then one sample, then the given model last', async () => {
		const r = await rank({ ...op, q: tag });
		expect(r.basis).toBe('bound');
		expect([r.coverage, r.confidence]).toEqual([0.95, 0.9]);
		expect(names(r)).toEqual(['small', 'tight', 'wide', 'one', 'given']);
		const given = r.items.at(-1)!;
		expect(given.evidence).toBe('given');
		expect(given.bound).toBeNull();
		expect(given.leakageA.bound).toBeNull();
		const one = r.items.find((i) => i.partNumber.endsWith('-one'))!;
		expect(one.evidence).toBe('measured');
		expect(one.leakageA.bound).toBeNull();
		// The lowest leakage of all is the given part's; ignorance never ranks first.
		expect(Math.min(...r.items.map((i) => i.leakageA.worst))).toBe(given.leakageA.worst);
	});

	test('the bound equals exp(ȳ + k·s) over the samples the item lists, with its terms', async () => {
		const r = await rank({ ...op, q: `${tag}-wide`, withSamples: true });
		const [item] = r.items;
		expect(item.sampleLeakage!.map((s) => s.unit)).toEqual(['W1', 'W2', 'W3']);
		expect(item.samples).toBe(3);
		const values = item.sampleLeakage!.map((s) => s.leakageA);
		const k = toleranceFactor(3, 0.95, 0.9); // 5.311, Natrella NBS Handbook 91 Table A-7
		expect(item.bound).toEqual({ n: 3, k, coverage: 0.95, confidence: 0.9 });
		expect(rel(item.leakageA.bound!, logNormalUpperBound(values, k))).toBeLessThan(1e-12);
		expect(item.leakageA.worst).toBe(Math.max(...values));
		// Without withSamples the items stay lean.
		expect((await rank({ ...op, q: `${tag}-wide` })).items[0].sampleLeakage).toBeUndefined();
		// Coverage and confidence are the designer's.
		const strict = (await rank({ ...op, q: `${tag}-wide`, coverage: 0.99, confidence: 0.95 })).items[0];
		expect(strict.bound!.k).toBe(toleranceFactor(3, 0.99, 0.95));
		expect(strict.leakageA.bound!).toBeGreaterThan(item.leakageA.bound!);
	});

	test('under "worst" and "typical" the one-sample part leads and the given part still comes last', async () => {
		const worst = await rank({ ...op, q: tag, basis: 'worst' });
		expect(worst.basis).toBe('worst');
		expect(names(worst)).toEqual(['one', 'small', 'wide', 'tight', 'given']);
		const typical = await rank({ ...op, q: tag, basis: 'typical' });
		expect(names(typical)).toEqual(['one', 'small', 'wide', 'tight', 'given']);
	});

	test('the leakage budget is judged on the basis', async () => {
		const base = await rank({ ...op, q: `${tag}-wide` });
		const w = base.items[0];
		const budget = Math.sqrt(w.leakageA.worst * w.leakageA.bound!); // between the worst sample and the bound
		const onBound = (await rank({ ...op, q: `${tag}-wide`, leakageTargetA: budget })).items[0];
		expect(onBound.flags).toContain('over-leakage-target');
		expect(onBound.meetsLimits).toBe(false);
		const onWorst = (await rank({ ...op, q: `${tag}-wide`, leakageTargetA: budget, basis: 'worst' })).items[0];
		expect(onWorst.meetsLimits).toBe(true);
	});

	test('a clamp current above the rated forward current is flagged in words and counts as a missed limit', async () => {
		const r = await rank({ ...op, q: tag, clampCurrentA: 0.05 });
		const small = r.items.find((i) => i.partNumber.endsWith('-small'))!;
		expect(small.flags).toContain('over-forward-rating');
		expect(small.meetsLimits).toBe(false);
		expect(names(r).at(-1)).toBe('small');
		const ok = (await rank({ ...op, q: `${tag}-small`, clampCurrentA: 0.005 })).items[0];
		expect(ok.flags).not.toContain('over-forward-rating');
	});

	test('bad basis, coverage or confidence: a 400 whose message names the field', async () => {
		const cases: [Record<string, unknown>, RegExp][] = [
			[{ coverage: 1.2 }, /coverage must lie between 0\.5 and 0\.999/],
			[{ confidence: 0.2 }, /confidence must lie between 0\.5 and 0\.999/],
			[{ coverage: 'most' }, /coverage must be a number/],
			[{ basis: 'best' }, /basis must be "bound".*"worst".*"typical"/],
			[{ withSamples: 'yes' }, /withSamples must be true or false/]
		];
		for (const [extra, message] of cases) {
			const r = await api('POST', '/api/v1/rank', { as: 'designer', json: { ...op, ...extra } });
			expect(r.status, JSON.stringify(extra)).toBe(400);
			expect(r.body.error.message).toMatch(message);
			expect(r.body.error.issues[0].path).toBe(Object.keys(extra)[0]);
		}
	});

	test('the ranking page carries the basis in its heading and says why a part sits lower', async () => {
		const page = await browse(`/rank?v=-5&tlo=0&thi=85&q=${tag}`, { as: 'designer' });
		expect(page.status).toBe(200);
		expect(page.text).toContain('Ranked by statistical bound (95 % of parts, 90 % confidence)');
		expect(page.text).toContain('one sample: no bound');
		expect(page.text).toContain('not measured: given model only');
		const worst = await browse(`/rank?v=-5&tlo=0&thi=85&q=${tag}&basis=worst&cov=99`, { as: 'designer' });
		expect(worst.text).toContain('Ranked by worst measured sample');
	});
});

describe('SPICE exports reproduce the prediction in ngspice', () => {
	const tag = unique('sp');
	// Invented parts with a shunt (default factor 2), breakdown, a recombination term, and a JFET-gate-like part with RSH.
	const spec: { name: string; kind?: TestPart['kind']; samples: StoredModel[]; shuntFactorPer10K?: number }[] = [
		{ name: 'shunt', samples: [0.7, 1, 1.6].map((f) => silicon(2e-15 * f, { RSH: 4e11 * f })) },
		{ name: 'breakdown', samples: [0.8, 1, 1.3].map((f) => silicon(1e-14 * f, { BV: 6.8, IBV: 1e-3 })) },
		{ name: 'recomb', samples: [0.5, 1, 2].map((f) => silicon(1e-15, { ISR: 3e-12 * f, NR: 2 })) },
		{ name: 'jfet', kind: 'jfet-gate', samples: [0.6, 1, 1.9].map((f) => ({ IS: 4e-16 * f, N: 1.02, RS: 40, RSH: 2e12 / f, TNOM: 25 })), shuntFactorPer10K: 1.8 }
	];
	const units = ['A1', 'A2', 'A3'];
	const ids = new Map<string, number>();
	const BIASES = [-10, -5, -0.5, -2e-3, 2e-3, 0.3, 0.6];
	const TEMPS = [0, 27, 70, 125];

	beforeAll(async () => {
		const list = spec.map((s) => ({ partNumber: `${tag}-${s.name}`, kind: s.kind, samples: s.samples, typical: s.samples[1], sampleUnits: units, shuntFactorPer10K: s.shuntFactorPer10K }));
		const made = await createParts(list);
		created.push(...made);
		spec.forEach((s, i) => ids.set(s.name, made[i]));
		await seen(tag, spec.length);
	});

	async function block(name: string, query = '') {
		const r = await api<string>('GET', `/api/v1/junctions/${ids.get(name)}/spice${query}`, { as: 'designer' });
		expect(r.status, String(r.body)).toBe(200);
		expect(r.headers.get('content-type')).toMatch(/^text\/plain/);
		expect(r.body).toMatch(/^[\x20-\x7e\n]*$/);
		return r.body;
	}

	const tolerance = (v: number, N: number, tC: number) => (v < -3 * N * thermalVoltage(celsiusToKelvin(tC), CODATA_2014) ? 5e-3 : 1e-4);

	for (const s of spec.filter((x) => x.shuntFactorPer10K === undefined)) {
		test(`${s.name}: the typical block agrees with /api/v1/predict at 0…125 °C, reverse, near zero and forward`, async () => {
			const text = await block(s.name);
			expect(text).toMatch(s.samples[1].RSH || s.samples[1].ISR ? /^\.subckt /m : /^\.model /m);
			for (const tC of TEMPS) {
				const sim = blockCurrents(text, tC, BIASES);
				const p = await api('POST', '/api/v1/predict', { as: 'designer', json: { model: s.samples[1], temperatureC: tC, biasV: BIASES } });
				expect(p.status).toBe(200);
				BIASES.forEach((v, k) =>
					expect(rel(sim[k], p.body.currentA[k]), `${s.name} ${v} V ${tC} °C: ngspice ${sim[k]}, predict ${p.body.currentA[k]}`).toBeLessThan(tolerance(v, s.samples[1].N, tC))
				);
			}
		});
	}

	for (const s of spec) {
		test(`${s.name}: every sample's block and the worst-at-the-point block agree with the rank item`, async () => {
			for (const point of [
				{ biasV: -5, temperatureC: 70 },
				{ biasV: -2e-3, temperatureC: 125 },
				{ biasV: 0.3, temperatureC: 0 }
			]) {
				const [item] = (await rank({ ...point, q: `${tag}-${s.name}`, withSamples: true })).items as RankItem[];
				for (const { unit, leakageA } of item.sampleLeakage!) {
					const [sim] = blockCurrents(await block(s.name, `?sample=${unit}`), point.temperatureC, [point.biasV]);
					expect(rel(Math.abs(sim), leakageA), `${s.name} ${unit} at ${JSON.stringify(point)}`).toBeLessThan(tolerance(point.biasV, s.samples[0].N, point.temperatureC));
				}
				const leakiest = item.sampleLeakage!.reduce((a, b) => (b.leakageA > a.leakageA ? b : a));
				const worst = await block(s.name, `?sample=worst&biasV=${point.biasV}&temperatureC=${point.temperatureC}`);
				expect(worst).toContain(`sample ${leakiest.unit}: of the 3 measured samples the one that leaks most`);
				const [sim] = blockCurrents(worst, point.temperatureC, [point.biasV]);
				expect(rel(Math.abs(sim), item.leakageA.worst)).toBeLessThan(tolerance(point.biasV, s.samples[0].N, point.temperatureC));
			}
		});
	}

	test('the JFET-gate block scales its shunt by the part\'s factor: the API, the part page and /parts/{id}/spice give the same text', async () => {
		const text = await block('jfet');
		// 1.8 per 10 K: tce = −ln 1.8 / (10·ln 1.01).
		expect(text).toContain(`tce=${Number((-Math.log(1.8) / (10 * Math.log(1.01))).toPrecision(7))}`);
		expect(text).toContain('JFET gate junction');
		const download = await browse(`/parts/${ids.get('jfet')}/spice`, { as: 'designer' });
		expect(download.text).toBe(text);
		const page = await browse(`/parts/${ids.get('jfet')}`, { as: 'designer' });
		expect(page.text).toContain('.subckt ');
		expect(page.text).toContain('Leakage over the samples at reference conditions');
	});

	test('refuses what it cannot export, saying why', async () => {
		const noUnit = await api('GET', `/api/v1/junctions/${ids.get('shunt')}/spice?sample=Z9`, { as: 'designer' });
		expect(noUnit.status).toBe(404);
		expect(noUnit.body.error.message).toMatch(/no measured sample 'Z9'; its samples are A1, A2, A3/);
		const noPoint = await api('GET', `/api/v1/junctions/${ids.get('shunt')}/spice?sample=worst&biasV=-5`, { as: 'designer' });
		expect(noPoint.status).toBe(400);
		expect(noPoint.body.error.message).toMatch(/temperatureC/);
		const missing = await api('GET', '/api/v1/junctions/999999999/spice', { as: 'designer' });
		expect(missing.status).toBe(404);
		expect((await api('GET', `/api/v1/junctions/${ids.get('shunt')}/spice`, { as: 'anonymous' })).status).toBe(401);
	});
});
