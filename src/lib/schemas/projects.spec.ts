import { describe, expect, test } from 'vitest';
import { createProjectSchema, emailList, requirementFromForm, reviewSchema, type RequirementForm } from './projects';

const blank: RequirementForm = { bias: '', tempLo: '', tempHi: '', clamp: '', maxDrop: '', leakageTarget: '', allowedError: '', sourceR: '' };

describe('requirement typed on the form', () => {
	test('SI prefixes, units and typographic minus are read into base units', () => {
		const r = requirementFromForm({ ...blank, bias: '−5 V', tempLo: '0 °C', tempHi: '358.15 K', leakageTarget: '10p', clamp: '1 mA', maxDrop: '650m', sourceR: '10 meg' });
		expect(r.errors).toEqual({});
		expect(r.requirement).toEqual({
			biasV: -5,
			temperatureRangeC: [0, expect.closeTo(85, 9)],
			leakageTargetA: 1e-11,
			clampCurrentA: 1e-3,
			maxForwardDropV: 0.65,
			sourceResistanceOhm: 1e7
		});
	});
	test('one temperature alone is a single point', () => {
		expect(requirementFromForm({ ...blank, bias: '0.3', tempHi: '125C' }).requirement).toEqual({ biasV: 0.3, temperatureC: 125 });
	});
	test('each unreadable field is named, with what was expected', () => {
		const r = requirementFromForm({ ...blank, bias: 'five volts', tempLo: '', leakageTarget: '10 pV' });
		expect(r.requirement).toBeUndefined();
		expect(r.errors.bias).toBe('Not read as a voltage: write it like −5 V or 612 mV.');
		expect(r.errors.tempLo).toMatch(/temperature/);
		expect(r.errors.leakageTarget).toBe('Not read as a current: write it like 200 mA or 10p.');
	});
	test('messages name the field as the form labels it, never the API key', () => {
		const r = requirementFromForm({ ...blank, bias: '-5', tempHi: '25', clamp: '-1 mA', leakageTarget: '0' });
		expect(r.errors).toEqual({ clamp: 'The clamp current must be above zero.', leakageTarget: 'The leakage target must be above zero.' });
		for (const m of Object.values(r.errors)) expect(m).not.toMatch(/[a-z][A-Z]/); // no camelCase keys
	});
	test('a typed 10f is stored as the double nearest 1e-14, without rounding noise', () => {
		expect(requirementFromForm({ ...blank, bias: '-1', tempHi: '25', leakageTarget: '10f' }).requirement?.leakageTargetA).toBe(1e-14);
	});
	test('an allowed error goes with a source resistance, and instead of a leakage target', () => {
		const ok = requirementFromForm({ ...blank, bias: '-5', tempHi: '85', allowedError: '1 mV', sourceR: '1 G' });
		expect(ok.requirement).toEqual({ biasV: -5, temperatureC: 85, allowedErrorV: 1e-3, sourceResistanceOhm: 1e9 });
		expect(requirementFromForm({ ...blank, bias: '-5', tempHi: '85', allowedError: '1 mV' }).errors.sourceR).toMatch(/source resistance/);
		expect(requirementFromForm({ ...blank, bias: '-5', tempHi: '85', allowedError: '1 mV', sourceR: '1G', leakageTarget: '1p' }).errors.leakageTarget).toMatch(/not both/);
	});
	test('a reversed range and a drop limit without a clamp current are refused on their fields', () => {
		expect(requirementFromForm({ ...blank, bias: '-5', tempLo: '85', tempHi: '0' }).errors.tempLo).toMatch(/cold end/);
		expect(requirementFromForm({ ...blank, bias: '-5', tempLo: '25', maxDrop: '700m' }).errors.clamp).toMatch(/clamp current/);
	});
});

describe('API shapes', () => {
	test('a project needs a name and a temperature; unknown keys are refused', () => {
		const r = createProjectSchema.safeParse({ name: ' ', requirement: { biasV: -5 }, colour: 'red' });
		expect(r.success).toBe(false);
		const paths = r.error!.issues.map((i) => i.path.join('.'));
		expect(paths).toContain('name');
		expect(paths).toContain('requirement.temperatureC');
		expect(r.error!.issues.some((i) => i.code === 'unrecognized_keys')).toBe(true);
	});
	test('sending back or declining needs a comment; approving does not', () => {
		expect(reviewSchema.safeParse({ action: 'request-changes', comment: '  ' }).success).toBe(false);
		expect(reviewSchema.safeParse({ action: 'reject', comment: '' }).success).toBe(false);
		expect(reviewSchema.safeParse({ action: 'approve', comment: '' }).success).toBe(true);
		expect(reviewSchema.safeParse({ action: 'archive', comment: 'x' }).success).toBe(false);
	});
	test('member lists split on commas and spaces and name the bad address', () => {
		expect(emailList('a@x.test, B@y.test c@z.test')).toEqual({ emails: ['a@x.test', 'b@y.test', 'c@z.test'] });
		expect(emailList('a@x.test, nope').error).toMatch(/nope/);
	});
});
