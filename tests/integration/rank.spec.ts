// Ranking values and order against ngspice 39 (run here, never pasted numbers), the flags
// each crafted part raises, the API's error shape, and the page without JavaScript.
//
// Tolerances: 2e-5 relative (ngspice compiles in CODATA 2014 k and q, ~6e-8 away from the
// exact SI values the app uses); below −3·N·Vt ngspice replaces Shockley with a cubic
// approximation up to ~0.4 % away, so reverse leakage there is compared within 0.5 %.
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { createModel, emitModelCard, CODATA_2014, thermalVoltage, celsiusToKelvin } from '$lib/junction';
import type { StoredModel } from '$lib/server/db/schema';
import { FLAG_WORDS, type RankItem, type RankOperatingPoint } from '$lib/schemas/rank';
import { PRECISE_OPTIONS, runNgspiceOp } from '../reference/ngspice';
import { api, browse, unique } from './helpers';
import { createParts, deleteParts, rank, seen, WELL_MEASURED, type TestPart } from './rank-fixtures';

const created: number[] = [];
afterAll(async () => deleteParts(created));

// Invented catalogue: seven parts, three samples each (IS spread ×0.6…×1.7), plain SPICE
// diode models without shunt so that ngspice's diode element is the whole reference. G is a
// wide-gap emitter whose drop rises with temperature (its drop exceeds EG), so the worst
// forward drop comes from the hot end there and from the cold end for the others.
const tag = unique('ng');
const BASE: { name: string; IS: number; N: number; RS: number; EG?: number; XTI?: number; kind?: TestPart['kind'] }[] = [
	{ name: 'A', IS: 1e-15, N: 1.0, RS: 0.5 },
	{ name: 'B', IS: 3e-14, N: 1.05, RS: 1.2 },
	{ name: 'C', IS: 2e-16, N: 1.0, RS: 4 },
	{ name: 'D', IS: 5e-13, N: 1.8, RS: 0.2 },
	{ name: 'E', IS: 1e-9, N: 1.04, RS: 2, EG: 0.69, XTI: 2, kind: 'schottky' },
	{ name: 'F', IS: 8e-15, N: 1.3, RS: 0 },
	{ name: 'G', IS: 1e-24, N: 2, RS: 3, EG: 2.2, XTI: 3, kind: 'led' }
];
const SPREAD = [0.6, 1, 1.7];
const catalogue: TestPart[] = BASE.map((b) => ({
	partNumber: `${tag}-${b.name}`,
	kind: b.kind ?? 'diode',
	material: b.kind === 'schottky' ? 'metal-semiconductor' : b.kind === 'led' ? 'wide-gap' : 'silicon',
	samples: SPREAD.map((k) => {
		const m: StoredModel = { IS: b.IS * k, N: b.N, RS: b.RS, TNOM: 27 };
		if (b.EG) m.EG = b.EG;
		if (b.XTI) m.XTI = b.XTI;
		return m;
	})
}));

const OPERATING_POINTS: RankOperatingPoint[] = [
	{ biasV: -5, temperatureRangeC: [25, 85], clampCurrentA: 1e-3 },
	{ biasV: -0.02, temperatureC: 25, clampCurrentA: 1e-4 },
	{ biasV: 0.3, temperatureRangeC: [-40, 125], clampCurrentA: 1e-2 },
	{ biasV: -1, temperatureRangeC: [0, 70] }
];

const median = (xs: number[]) => {
	const s = [...xs].sort((a, b) => a - b);
	return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

type Expected = { partNumber: string; typical: number; worst: number; cubic: boolean; drop?: { hot: number; cold: number; worst: number } };

/** One ngspice run per operating point: every sample at the bias (hot end) and at the clamp current (both ends). */
function ngspiceExpectations(op: RankOperatingPoint): Expected[] {
	const hot = op.temperatureRangeC ? op.temperatureRangeC[1] : op.temperatureC!;
	const cold = op.temperatureRangeC ? op.temperatureRangeC[0] : op.temperatureC!;
	const lines: string[] = [];
	const prints: string[] = [];
	const plan: { part: string; n: number; samples: { i: string; vh?: string; vc?: string }[] }[] = [];
	let k = 0;
	catalogue.forEach((p, pi) => {
		const entry = { part: p.partNumber, n: p.samples[0].N, samples: [] as { i: string; vh?: string; vc?: string }[] };
		p.samples.forEach((s, si) => {
			const model = createModel(s, p.material);
			const name = `p${pi}s${si}`;
			lines.push(emitModelCard(name, model, { forSimulator: true }));
			k++;
			lines.push(`vb${k} b${k} 0 dc ${op.biasV}`, `db${k} b${k} 0 ${name} temp=${hot}`);
			const sample: { i: string; vh?: string; vc?: string } = { i: `@db${k}[id]` };
			if (op.clampCurrentA) {
				lines.push(`ih${k} 0 h${k} dc ${op.clampCurrentA}`, `dh${k} h${k} 0 ${name} temp=${hot}`);
				lines.push(`ic${k} 0 c${k} dc ${op.clampCurrentA}`, `dc${k} c${k} 0 ${name} temp=${cold}`);
				sample.vh = `v(h${k})`;
				sample.vc = `v(c${k})`;
			}
			prints.push(...Object.values(sample));
			entry.samples.push(sample);
		});
		plan.push(entry);
	});
	const values = runNgspiceOp({ netlist: lines.join('\n'), prints, options: PRECISE_OPTIONS });
	const vt = thermalVoltage(celsiusToKelvin(hot), CODATA_2014);
	return plan.map((e) => {
		// The diode's own current: through RS, the source's current is only as good as vntol × 1/RS.
		const leak = e.samples.map((s) => Math.abs(values.get(s.i.toLowerCase())!));
		const out: Expected = { partNumber: e.part, typical: median(leak), worst: Math.max(...leak), cubic: op.biasV < -3 * e.n * vt };
		if (op.clampCurrentA) {
			const vh = e.samples.map((s) => values.get(s.vh!.toLowerCase())!);
			const vc = e.samples.map((s) => values.get(s.vc!.toLowerCase())!);
			// The worst drop is the larger of both ends over every sample, as a designer reads it.
			out.drop = { hot: median(vh), cold: median(vc), worst: Math.max(...vc, ...vh) };
		}
		return out;
	});
}

function rel(a: number, b: number) {
	return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

describe('ranking against ngspice', () => {
	beforeAll(async () => {
		created.push(...(await createParts(catalogue)));
		await seen(tag, catalogue.length);
	});

	for (const op of OPERATING_POINTS) {
		test(`values and order at ${JSON.stringify(op)}`, async () => {
			// Ranked on the worst sample, the number ngspice gives directly (the bound has its own specs).
			const got = await rank({ ...op, q: tag, basis: 'worst' });
			const expected = ngspiceExpectations(op).sort((a, b) => a.worst - b.worst || a.typical - b.typical);
			expect(got.items.map((i) => i.partNumber)).toEqual(expected.map((e) => e.partNumber));
			// Both ends matter: ngspice puts the emitter's larger drop at the hot end, the diodes' at the cold end.
			const emitter = expected.find((e) => e.partNumber.endsWith('-G'))!.drop;
			if (emitter && op.temperatureRangeC) expect(emitter.hot).toBeGreaterThan(emitter.cold);
			for (const [n, e] of expected.entries()) {
				const item = got.items[n];
				const tol = e.cubic ? 5e-3 : 2e-5;
				expect(rel(item.leakageA.worst, e.worst), `${e.partNumber} worst`).toBeLessThan(tol);
				expect(rel(item.leakageA.typical, e.typical), `${e.partNumber} typical`).toBeLessThan(tol);
				if (e.drop) {
					expect(rel(item.forwardDropV!.hot, e.drop.hot), `${e.partNumber} drop hot`).toBeLessThan(2e-5);
					expect(rel(item.forwardDropV!.cold, e.drop.cold), `${e.partNumber} drop cold`).toBeLessThan(2e-5);
					expect(rel(item.forwardDropV!.worst, e.drop.worst), `${e.partNumber} drop worst`).toBeLessThan(2e-5);
				} else expect(item.forwardDropV).toBeNull();
			}
		});
	}

	test('predict matches ngspice for one model at several biases and a forward current', async () => {
		const model = { IS: 2e-14, N: 1.1, RS: 1.5, TNOM: 27 };
		const biasV = [-2, -0.01, 0.1, 0.5];
		const r = await api('POST', '/api/v1/predict', { as: 'librarian', json: { model, temperatureC: 60, biasV, currentA: [1e-3] } });
		expect(r.status).toBe(200);
		const m = createModel(model);
		const lines = [emitModelCard('pm', m, { forSimulator: true })];
		biasV.forEach((v, i) => lines.push(`v${i} a${i} 0 dc ${v}`, `dp${i} a${i} 0 pm temp=60`));
		lines.push('isrc 0 f dc 1e-3', 'df f 0 pm temp=60');
		const ref = runNgspiceOp({ netlist: lines.join('\n'), prints: [...biasV.map((_, i) => `@dp${i}[id]`), 'v(f)'], options: PRECISE_OPTIONS });
		const vt = thermalVoltage(celsiusToKelvin(60), CODATA_2014);
		biasV.forEach((v, i) => {
			const tol = v < -3 * 1.1 * vt ? 5e-3 : 2e-5;
			expect(rel(r.body.currentA[i], ref.get(`@dp${i}[id]`)!)).toBeLessThan(tol);
		});
		expect(rel(r.body.forwardV[0], ref.get('v(f)')!)).toBeLessThan(2e-5);
	});
});

describe('flags raised by crafted parts', () => {
	const ftag = unique('fl');
	const good: StoredModel[] = [1, 1.1, 0.9].map((k) => ({ IS: 1e-15 * k, N: 1, RS: 1, TNOM: 27 }));
	const m = WELL_MEASURED;
	// Each part differs from the clean one in one respect, and must raise exactly that flag.
	const cases: [string, Partial<TestPart>, RankItem['flags']][] = [
		['clean', {}, []],
		['extrap-current', { measured: { ...m, minCurrentA: 1e-9 } }, ['current-extrapolated']],
		['extrap-temp', { measured: { ...m, temperaturesC: [25] } }, ['temperature-extrapolated']],
		['no-reverse', { measured: { ...m, reverseMeasured: false } }, ['reverse-not-measured']],
		['schottky', { kind: 'schottky', material: 'metal-semiconductor' }, ['metal-semiconductor']],
		['glass', { admitsLight: true, package: 'DO-35 glass' }, ['light-sensitive']],
		['poor-fit', { measured: { ...m, worstRmsResidualV: 5e-3 } }, ['poor-fit']],
		['two-samples', { samples: good.slice(0, 2) }, ['few-samples']],
		['low-rating', { ratedReverseV: 4 }, ['over-reverse-rating']],
		['slow-clamp', { samples: good.map((s) => ({ ...s, RS: 200 })) }, ['forward-drop-over-limit']],
		['leaky', { samples: good.map((s) => ({ ...s, IS: s.IS * 1e4 })) }, ['over-leakage-target']]
	];
	// 0…85 °C, measured at −40/25/85/125 °C (WELL_MEASURED); -5 V against the 30 V default rating.
	const op: RankOperatingPoint = {
		biasV: -5,
		temperatureRangeC: [0, 85],
		clampCurrentA: 1e-3,
		maxForwardDropV: 0.85,
		leakageTargetA: 1e-11,
		includeOverRating: true
	};

	beforeAll(async () => {
		const parts = cases.map(([name, patch]) => ({ partNumber: `${ftag}-${name}`, samples: good, ...patch }) as TestPart);
		created.push(...(await createParts(parts)));
		await seen(ftag, cases.length);
	});

	// Flags that mean the part fails a limit the operating point states.
	const LIMIT_FLAGS: RankItem['flags'] = ['forward-drop-over-limit', 'over-leakage-target', 'over-capacitance-limit', 'over-reverse-rating'];

	for (const [name, , flags] of cases) {
		test(`${name} → ${flags.join(', ') || 'no flag'}`, async () => {
			const r = await rank({ ...op, q: `${ftag}-${name}` });
			const item = r.items.find((i) => i.partNumber === `${ftag}-${name}`);
			expect(item, 'the part is listed').toBeDefined();
			expect(item!.flags).toEqual(flags);
			expect(item!.meetsLimits).toBe(!flags.some((f) => LIMIT_FLAGS.includes(f)));
		});
	}

	test('parts meeting every limit come first, then the rest, each group by its leakage on the basis', async () => {
		// The clean part leaks more than the LED (N 2, IS 1e-20 A, about 2 V at 1 mA), whose
		// drop is over the 0.85 V limit: the clean part and the others within limits rank first.
		const [led] = await createParts([
			{ partNumber: `${ftag}-order-led`, kind: 'led', material: 'wide-gap', samples: good.map((s) => ({ ...s, IS: s.IS * 1e-5, N: 2, EG: 2.2 })) }
		]);
		created.push(led);
		await seen(`${ftag}-order-led`, 1);
		const r = await rank({ ...op, q: ftag, basis: 'worst' });
		const names = r.items.map((i) => i.partNumber.slice(ftag.length + 1));
		const ledItem = r.items.find((i) => i.partNumber === `${ftag}-order-led`)!;
		const clean = r.items.find((i) => i.partNumber === `${ftag}-clean`)!;
		expect(ledItem.leakageA.worst).toBeLessThan(clean.leakageA.worst);
		expect(ledItem.forwardDropV!.worst).toBeGreaterThan(1.5);
		expect(ledItem.meetsLimits).toBe(false);
		expect(names.indexOf('order-led')).toBeGreaterThan(names.indexOf('clean'));
		// Every part meeting the limits precedes every part failing one; each group by worst leakage.
		const meets = r.items.map((i) => i.meetsLimits);
		expect(meets).toEqual([...meets].sort((a, b) => Number(b) - Number(a)));
		expect(meets.filter(Boolean).length).toBeGreaterThan(3);
		for (const group of [true, false]) {
			const worst = r.items.filter((i) => i.meetsLimits === group).map((i) => i.leakageA.worst);
			expect(worst).toEqual([...worst].sort((a, b) => a - b));
		}
		// Without the limits (and without the part over its rating) the LED leads, lowest leakage, and every part meets them.
		const free = await rank({ biasV: op.biasV, temperatureRangeC: op.temperatureRangeC, clampCurrentA: 1e-3, q: ftag });
		expect(free.items[0].partNumber).toBe(`${ftag}-order-led`);
		expect(free.items.every((i) => i.meetsLimits)).toBe(true);
	});

	test('a wide-gap part stored without EG raises band-gap-assumed; with EG it does not', async () => {
		const wide = (name: string, EG?: number): TestPart => ({
			partNumber: `${ftag}-${name}`,
			kind: 'led',
			material: 'wide-gap',
			samples: good.map((s) => ({ ...s, N: 2, IS: s.IS * 1e-5, ...(EG ? { EG } : {}) }))
		});
		const ids = await createParts([wide('eg-missing'), wide('eg-given', 2.9)]);
		created.push(...ids);
		await seen(`${ftag}-eg-`, 2);
		const r = await rank({ ...op, q: `${ftag}-eg-` });
		const flags = new Map(r.items.map((i) => [i.partNumber, i.flags]));
		expect(flags.get(`${ftag}-eg-missing`)).toContain('band-gap-assumed');
		expect(flags.get(`${ftag}-eg-given`)).not.toContain('band-gap-assumed');
		// The same words the ranking screen shows.
		expect(FLAG_WORDS['band-gap-assumed'].long).toMatch(/band gap/);
	});

	test('an LED is light-sensitive whatever its package', async () => {
		const [id] = await createParts([
			{ partNumber: `${ftag}-led`, kind: 'led', material: 'wide-gap', samples: good.map((s) => ({ ...s, EG: 2.2 })) }
		]);
		created.push(id);
		await seen(`${ftag}-led`, 1);
		const r = await rank({ ...op, q: `${ftag}-led` });
		expect(r.items[0].flags).toContain('light-sensitive');
	});

	test('parts over their reverse rating are left out unless asked for', async () => {
		const r = await rank({ ...op, includeOverRating: false, q: ftag });
		expect(r.items.map((i) => i.partNumber)).not.toContain(`${ftag}-low-rating`);
		expect(r.excludedOverRating).toBe(1);
		// A 2 V margin puts the 4 V part further over, and the 30 V parts still fit.
		const m2 = await rank({ ...op, reverseMarginV: 2, q: `${ftag}-clean` });
		expect(m2.items[0].reverseMarginV).toBe(25);
	});

	test('error voltage is worst leakage × source resistance; the budget comes from it', async () => {
		const r = await rank({ ...op, leakageTargetA: undefined, sourceResistanceOhm: 1e10, allowedErrorV: 1e-3, q: `${ftag}-leaky` });
		const item = r.items[0];
		expect(item.errorVoltageV).toBeCloseTo(item.leakageA.worst * 1e10, 20);
		expect(r.leakageBudgetA).toBeCloseTo(1e-13, 25);
		expect(item.flags).toContain('over-leakage-target');
	});
});

describe('API errors and the no-JavaScript page', () => {
	test('a bad operating point is a 400 naming the field', async () => {
		const r = await api('POST', '/api/v1/rank', { as: 'designer', json: { biasV: 'five', temperatureC: 25 } });
		expect(r.status).toBe(400);
		expect(r.body.error.code).toBe('bad_request');
		expect(r.body.error.issues.map((i: { path: string }) => i.path)).toContain('biasV');
		const both = await api('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -1, temperatureC: 25, temperatureRangeC: [0, 70] } });
		expect(both.status).toBe(400);
		expect(JSON.stringify(both.body.error.issues)).toMatch(/either temperatureC or temperatureRangeC/);
		const limit = await api('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -1, temperatureC: 25, limit: 1001 } });
		expect(limit.status).toBe(400);
		const junk = await api('POST', '/api/v1/rank', { as: 'designer', body: '{not json', headers: { 'content-type': 'application/json' } });
		expect(junk.status).toBe(400);
		expect(junk.body.error.message).toMatch(/not valid JSON/);
	});

	test('predict refuses an impossible model with a 400 or 422 naming it', async () => {
		const r = await api('POST', '/api/v1/predict', { as: 'designer', json: { model: { IS: -1, N: 1 }, temperatureC: 25, biasV: [0.5] } });
		expect(r.status).toBe(400);
		expect(r.body.error.issues[0].path).toBe('model.IS');
	});

	test('GET /rank?… lists the ranked rows in the HTML, in order', async () => {
		const page = await browse(`/rank?v=-5&tlo=25&thi=85&ic=1m&q=${tag}`, { as: 'designer' });
		expect(page.status).toBe(200);
		const expected = (await rank({ biasV: -5, temperatureRangeC: [25, 85], clampCurrentA: 1e-3, q: tag })).items.map((i) => i.partNumber);
		expect(expected.length).toBe(catalogue.length);
		const positions = expected.map((p) => page.text.indexOf(`data-part="${p}"`));
		expect(positions.every((p) => p > 0)).toBe(true);
		expect([...positions].sort((a, b) => a - b)).toEqual(positions);
	});

	test('GET /rank with a typo shows the error beside the field', async () => {
		const page = await browse('/rank?v=five&thi=25', { as: 'designer' });
		expect(page.status).toBe(200);
		expect(page.text).toMatch(/expected a voltage/);
	});
});
