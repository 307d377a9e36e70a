import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { parseQuantity } from '$lib/junction';
import type { RankOperatingPoint } from '$lib/schemas/rank';
import {
	compactNumber,
	DEFAULT_FIELDS,
	fieldsFromQuery,
	operatingPointFromQuery,
	parseFields,
	queryFromFields,
	queryFromOperatingPoint,
	screenMessage
} from './operating-point-url';

describe('operating point ↔ query string', () => {
	test('a full operating point survives the round trip exactly', () => {
		const op: RankOperatingPoint = {
			biasV: -5,
			temperatureRangeC: [-40, 85],
			clampCurrentA: 1e-3,
			maxForwardDropV: 0.7,
			reverseMarginV: 2,
			includeOverRating: true,
			sourceResistanceOhm: 1e10,
			allowedErrorV: 1e-3,
			maxCapacitanceF: 2e-12,
			maxNoiseA_rtHz: 5e-15,
			kinds: ['diode', 'bjt-diode'],
			lifecycles: ['in-use'],
			packages: ['SOD-323', 'TO-18'],
			q: 'low leak'
		};
		const query = queryFromOperatingPoint(op);
		expect(query.toString()).toBe(
			'v=-5&tlo=-40&thi=85&ic=1m&vf=0.7&margin=2&rs=10G&verr=1m&cmax=2p&nmax=5f&pkg=SOD-323%2C+TO-18&q=low+leak&over=1&kind=diode&kind=bjt-diode&life=in-use'
		);
		expect(operatingPointFromQuery(new URLSearchParams(query.toString()))).toEqual({ op, errors: {} });
	});

	test('a noise limit typed as a density per root hertz', () => {
		for (const typed of ['5 fA/√Hz', '5f', '5e-15 A/rtHz'])
			expect(Math.abs(parseFields({ ...DEFAULT_FIELDS, maxNoise: typed }).op!.maxNoiseA_rtHz! / 5e-15 - 1)).toBeLessThan(1e-12);
		expect(parseFields({ ...DEFAULT_FIELDS, maxNoise: 'quiet' }).errors.maxNoise).toMatch(/noise density/);
	});

	test('a single temperature and a leakage target', () => {
		const op: RankOperatingPoint = { biasV: 0.25, temperatureC: 25, leakageTargetA: 3e-15 };
		const back = operatingPointFromQuery(queryFromOperatingPoint(op));
		expect(back.op).toEqual(op);
	});

	test('any bias, range and current round-trips to 12 significant figures, and the query it writes is a fixed point', () => {
		const twelve = (v: number) => Number(v.toPrecision(12));
		fc.assert(
			fc.property(
				fc.double({ min: -1000, max: 1000, noNaN: true }).map((v) => (Object.is(v, -0) ? 0 : v)), // −0 V is 0 V
				fc.integer({ min: -55, max: 150 }),
				fc.integer({ min: 0, max: 60 }),
				fc.double({ min: 1e-15, max: 10, noNaN: true }),
				(biasV, lo, span, clampCurrentA) => {
					const op: RankOperatingPoint = { biasV, temperatureRangeC: [lo, lo + span], clampCurrentA };
					const query = queryFromOperatingPoint(op);
					const back = operatingPointFromQuery(query).op!;
					expect(back).toEqual({ ...op, biasV: twelve(biasV), clampCurrentA: twelve(clampCurrentA) });
					expect(queryFromOperatingPoint(back).toString()).toBe(query.toString());
					// Short: at most 12 digits and a prefix, never 17 digits of float noise.
					const significant = (v: string) => v.replace(/e.*$/, '').replace(/[^0-9]/g, '').replace(/^0+|0+$/g, '').length;
					for (const [, v] of query) expect(significant(v)).toBeLessThanOrEqual(12);
				}
			)
		);
	});

	test('float noise from arithmetic is written as the short number a person would type', () => {
		const noisy: RankOperatingPoint = { biasV: -5, temperatureC: 85, leakageTargetA: 10 * 1e-15, sourceResistanceOhm: 1e10, maxCapacitanceF: 33 * 1e-9 * 1e-3 };
		expect(noisy.leakageTargetA).toBe(1.0000000000000002e-14);
		expect(queryFromOperatingPoint(noisy).toString()).toBe('v=-5&thi=85&rs=10G&ileak=10f&cmax=33p');
		expect(compactNumber(1e-14, 'current')).toBe('10f');
	});

	test('an empty query means the default operating point', () => {
		expect(fieldsFromQuery(new URLSearchParams(''))).toEqual(DEFAULT_FIELDS);
		const { op } = parseFields(DEFAULT_FIELDS);
		expect(op).toEqual({ biasV: -5, temperatureRangeC: [25, 85], clampCurrentA: 1e-3, maxForwardDropV: 0.7 });
	});

	test('what people type: SI prefixes, units, typographic minus, °C and kelvin', () => {
		const f = { ...DEFAULT_FIELDS, bias: '−5 V', tLo: '233.15 K', tHi: '85 °C', clamp: '10 mA', source: '10 GΩ', allowedError: '1 mV' };
		expect(parseFields(f)).toEqual({
			op: {
				biasV: -5,
				temperatureRangeC: [-40, 85],
				clampCurrentA: 0.01,
				maxForwardDropV: 0.7,
				sourceResistanceOhm: 1e10,
				allowedErrorV: 1e-3
			},
			errors: {}
		});
	});

	test('a range typed into one box', () => {
		expect(parseFields({ ...DEFAULT_FIELDS, tLo: '', tHi: '-40…85' }).op?.temperatureRangeC).toEqual([-40, 85]);
		expect(parseFields({ ...DEFAULT_FIELDS, tLo: '', tHi: '0..70 °C' }).op?.temperatureRangeC).toEqual([0, 70]);
	});

	test('errors name the field and what was expected', () => {
		const { op, errors } = parseFields({ ...DEFAULT_FIELDS, bias: 'five', clamp: '1 mV', tLo: '90', tHi: '85' });
		expect(op).toBeNull();
		expect(errors.bias).toMatch(/expected a voltage/);
		expect(errors.clamp).toMatch(/expected a current/);
		expect(errors.tLo).toMatch(/low end/);
	});

	test('cross-field rules come back on the right field', () => {
		const r1 = parseFields({ ...DEFAULT_FIELDS, allowedError: '1m' });
		expect(r1.errors.allowedError).toBe('An allowed error voltage needs the source resistance to turn it into a leakage.');
		const r2 = parseFields({ ...DEFAULT_FIELDS, source: '1G', allowedError: '1m', leakage: '1p' });
		expect(r2.errors.leakage).toMatch(/not both/);
		const r3 = parseFields({ ...DEFAULT_FIELDS, clamp: '-1m' });
		expect(r3.errors.clamp).toBe('The clamp current must be greater than zero.');
	});

	test('schema messages reach the screen in its words, never as API names', () => {
		const { errors } = parseFields({ ...DEFAULT_FIELDS, clamp: '-1m', maxDrop: '0', source: '0', allowedError: '1m', maxCap: '-1p', margin: '-1' });
		expect(errors).toMatchObject({
			clamp: 'The clamp current must be greater than zero.',
			maxDrop: 'The largest forward drop must be greater than zero.',
			source: 'The source resistance must be greater than zero.',
			maxCap: 'The largest capacitance must be greater than zero.',
			margin: 'The margin below the reverse rating must be zero or more.'
		});
		for (const m of Object.values(errors)) expect(m).not.toMatch(/[a-z][A-Z]|\[\d\]/);
		expect(screenMessage('Give either temperatureC or temperatureRangeC: [low, high], not both and not neither.')).toBe(
			'Give either one temperature or a range, not both and not neither.'
		);
		expect(screenMessage('temperatureRangeC[1] must lie between absolute zero and 1000 °C')).toBe('The highest temperature must lie between absolute zero and 1000 °C.');
	});

	test('unknown kinds and lifecycles in a hand-edited URL are dropped', () => {
		const f = fieldsFromQuery(new URLSearchParams('v=1&thi=25&kind=diode&kind=valve&life=gone'));
		expect(f.kinds).toEqual(['diode']);
		expect(f.lifecycles).toEqual([]);
		expect(queryFromFields(f).toString()).toBe('v=1&thi=25&kind=diode');
	});

	test('compact numbers are short, and read back as the value to 12 significant figures', () => {
		expect(compactNumber(1e-3, 'current')).toBe('1m');
		expect(compactNumber(1e10, 'resistance')).toBe('10G');
		expect(compactNumber(-5, 'voltage')).toBe('-5');
		// 3.3 × 1e-12 is not the double nearest 3.3e-12, but it is 3.3 pF to a person.
		expect(compactNumber(3.3e-12, 'capacitance')).toBe('3.3p');
		expect(compactNumber(1e-14, 'current')).toBe('10f');
		expect(compactNumber(2e-12, 'capacitance')).toBe('2p');
		const awkward = 0.1 + 0.2;
		expect(compactNumber(awkward, 'voltage')).toBe('0.3');
		expect(parseQuantity(compactNumber(1 / 3, 'voltage'), 'voltage')).toBeCloseTo(1 / 3, 12);
	});
});
