import { describe, expect, it } from 'vitest';
import { compilePattern, DEFAULT_PATTERN, matchPart, readName, type NameFields } from './file-pattern';

const def = compilePattern(DEFAULT_PATTERN);

describe('reading file names with the default pattern {part}_{sample}_{temperature}', () => {
	// Kelvin to Celsius: t/°C = T/K − 273.15 (BIPM SI Brochure, 9th ed., 2019, §2.3.1).
	it.each<[string, NameFields]>([
		['QVL-D9_S2_85C_rev.csv', { part: 'QVL-D9', sample: 'S2', temperatureC: 85, direction: 'reverse' }],
		['QVL-D9_S2_85C.csv', { part: 'QVL-D9', sample: 'S2', temperatureC: 85, direction: null }],
		['campaign/week 3/QVL-D9_U1_25C_fwd.CSV', { part: 'QVL-D9', sample: 'U1', temperatureC: 25, direction: 'forward' }],
		['QVL-D9_U1_-40C.csv', { part: 'QVL-D9', sample: 'U1', temperatureC: -40, direction: null }],
		['QVL-D9_U1_m40C.csv', { part: 'QVL-D9', sample: 'U1', temperatureC: -40, direction: null }],
		['QVL-D9_U1_25p5C.txt', { part: 'QVL-D9', sample: 'U1', temperatureC: 25.5, direction: null }],
		['QVL-D9_U1_358.15K.csv', { part: 'QVL-D9', sample: 'U1', temperatureC: 85, direction: null }],
		['QVL-D9_U1_300K_both.dat', { part: 'QVL-D9', sample: 'U1', temperatureC: 300 - 273.15, direction: 'both' }],
		['AB_12_U3_60C.csv', { part: 'AB_12', sample: 'U3', temperatureC: 60, direction: null }],
		['qvl-d9_s2_85c_REV.csv', { part: 'qvl-d9', sample: 's2', temperatureC: 85, direction: 'reverse' }]
	])('%s', (name, fields) => {
		const r = readName(name, def);
		expect(r.ok, JSON.stringify(r)).toBe(true);
		if (r.ok) {
			expect(r.fields.part).toBe(fields.part);
			expect(r.fields.sample).toBe(fields.sample);
			expect(r.fields.temperatureC).toBeCloseTo(fields.temperatureC, 9);
			expect(r.fields.direction).toBe(fields.direction);
		}
	});

	it.each([
		['QVL-D9_S2.csv', /does not fit/],
		['QVL-D9_S2_hotC.csv', /does not fit/],
		['QVL-D9_S2_85F.csv', /does not fit/],
		['QVL-D9_S2_85C_sideways.csv', /does not fit/],
		['QVL-D9_S2_250C.csv', /outside/],
		['QVL-D9_S2_0K.csv', /cannot be read/],
		['readme.txt', /does not fit/]
	])('refuses %s with a reason', (name, reason) => {
		const r = readName(name, def);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.reason).toMatch(reason);
	});
});

describe('other patterns', () => {
	it('reads fields in another order, with other separators and a skipped piece', () => {
		const p = compilePattern('{temperature} {direction} - {part} ({sample}) {skip}');
		const r = readName('85C rev - QVL-D9 (U4) run 2 final.csv', p);
		expect(r).toEqual({ ok: true, fields: { part: 'QVL-D9', sample: 'U4', temperatureC: 85, direction: 'reverse' } });
	});

	it.each([
		['{part}_{temperature}', /needs \{sample\}/],
		['{part}_{sample}', /needs \{temperature\}/],
		['{part}_{sample}_{temp}', /\{temp\} is not a field/],
		['{part}_{part}_{sample}_{temperature}', /appears twice/]
	])('refuses the pattern %s', (pattern, reason) => {
		const c = compilePattern(pattern);
		expect(c.ok).toBe(false);
		if (!c.ok) expect(c.reason).toMatch(reason);
	});
});

describe('matching the part', () => {
	const parts = [
		{ pn: 'QVL-D9', mk: 'Quillon Vale' },
		{ pn: 'XR 100', mk: 'Orrin' },
		{ pn: 'XR-100', mk: 'Brackwater' }
	];
	it('ignores case and punctuation, and names both parts when two fit', () => {
		expect(matchPart('qvl_d9', parts)).toEqual({ ok: true, part: parts[0] });
		expect(matchPart('QVLD10', parts)).toEqual({ ok: false, reason: 'no part “QVLD10” in the catalogue' });
		const two = matchPart('XR100', parts);
		expect(two.ok).toBe(false);
		if (!two.ok) expect(two.reason).toMatch(/Orrin XR 100 and Brackwater XR-100/);
	});
});
