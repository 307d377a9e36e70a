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
	queryFromOperatingPoint
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
			'v=-5&tlo=-40&thi=85&ic=1m&vf=0.7&margin=2&rs=10G&verr=1m&cmax=2p&nmax=5e-15&pkg=SOD-323%2C+TO-18&q=low+leak&over=1&kind=diode&kind=bjt-diode&life=in-use'
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

	test('any bias, range and current round-trips bit for bit', () => {
		fc.assert(
			fc.property(
				fc.double({ min: -1000, max: 1000, noNaN: true }).map((v) => (Object.is(v, -0) ? 0 : v)), // −0 V is 0 V
				fc.integer({ min: -55, max: 150 }),
				fc.integer({ min: 0, max: 60 }),
				fc.double({ min: 1e-15, max: 10, noNaN: true }),
				(biasV, lo, span, clampCurrentA) => {
					const op: RankOperatingPoint = { biasV, temperatureRangeC: [lo, lo + span], clampCurrentA };
					expect(operatingPointFromQuery(queryFromOperatingPoint(op)).op).toEqual(op);
				}
			)
		);
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
		expect(r1.errors.allowedError).toMatch(/sourceResistanceOhm/);
		const r2 = parseFields({ ...DEFAULT_FIELDS, source: '1G', allowedError: '1m', leakage: '1p' });
		expect(r2.errors.leakage).toMatch(/not both/);
		const r3 = parseFields({ ...DEFAULT_FIELDS, clamp: '-1m' });
		expect(r3.errors.clamp).toMatch(/greater than zero/);
	});

	test('unknown kinds and lifecycles in a hand-edited URL are dropped', () => {
		const f = fieldsFromQuery(new URLSearchParams('v=1&thi=25&kind=diode&kind=valve&life=gone'));
		expect(f.kinds).toEqual(['diode']);
		expect(f.lifecycles).toEqual([]);
		expect(queryFromFields(f).toString()).toBe('v=1&thi=25&kind=diode');
	});

	test('compact numbers are short and exact', () => {
		expect(compactNumber(1e-3, 'current')).toBe('1m');
		expect(compactNumber(1e10, 'resistance')).toBe('10G');
		expect(compactNumber(-5, 'voltage')).toBe('-5');
		// 3.3 × 1e-12 is not the double nearest 3.3e-12, so the exponent form is the exact one.
		expect(compactNumber(3.3e-12, 'capacitance')).toBe('3.3e-12');
		expect(compactNumber(2e-12, 'capacitance')).toBe('2p');
		const awkward = 0.1 + 0.2;
		expect(parseQuantity(compactNumber(awkward, 'voltage'), 'voltage')).toBe(awkward);
	});
});
