import { describe, expect, test } from 'vitest';
import { exactSI, quantityText, readQuantity, type FieldKind } from './quantity';
import { optionalQuantity, quantity } from './schemas/quantity';
import { partFormErrors, partFromForm, partInput } from './schemas/catalogue';

describe('what a quantity field understood', () => {
	test.each([
		['200 mA', 'current', 0.2, '200 mA = 0.2 A'],
		['0.2', 'current', 0.2, '200 mA = 0.2 A'],
		['10p', 'current', 1e-11, '10 pA'],
		['-5 V', 'voltage', -5, '−5 V'],
		['612m', 'voltage', 0.612, '612 mV = 0.612 V'],
		['10 meg', 'resistance', 1e7, '10 MΩ'],
		['3.3n', 'capacitance', 3.3e-9, '3.3 nF']
	] as [string, FieldKind, number, string][])('%s as %s is %s (%s)', (text, kind, value, understood) => {
		expect(readQuantity(text, kind)).toEqual({ ok: true, value, understood });
	});

	test('temperatures in °C or kelvin, read back in °C without a binary tail', () => {
		// 0 °C = 273.15 K exactly (SI Brochure, 9th edition, §2.3.1).
		expect(readQuantity('358.15 K', 'temperature')).toEqual({ ok: true, value: 85, understood: '85 °C' });
		expect(readQuantity('85', 'temperature')).toMatchObject({ ok: true, value: 85 });
		expect(readQuantity('-300 °C', 'temperature')).toEqual({ ok: false, message: 'That is at or below absolute zero.' });
	});

	test('an empty field is nothing; what cannot be read says how to write it', () => {
		expect(readQuantity('  ', 'current')).toBeNull();
		expect(readQuantity('200 mX', 'current')).toEqual({ ok: false, message: 'Not read as a current: write it like 200 mA or 10p.' });
		expect(readQuantity('five volts', 'voltage')).toEqual({ ok: false, message: 'Not read as a voltage: write it like −5 V or 612 mV.' });
		expect(readQuantity('hot', 'temperature')).toEqual({ ok: false, message: 'Not read as a temperature: write it like 85 °C or 358 K.' });
	});

	test('a stored value is written with as few figures as read back exactly', () => {
		expect(exactSI(0.2, 'A')).toBe('200 mA');
		expect(exactSI(0.1234, 'A')).toBe('123.4 mA');
		expect(quantityText(undefined, 'voltage')).toBe('');
		expect(quantityText(150, 'temperature')).toBe('150 °C');
		// Round trip: what an edit form shows is read back as the very same double.
		for (const [v, kind] of [
			[0.2, 'current'],
			[1 / 3, 'voltage'],
			[0.1 + 0.2, 'voltage'],
			[4.7e6, 'resistance'],
			[1e-14, 'current'],
			[123456.789, 'resistance'],
			[-0.000123, 'voltage']
		] as [number, FieldKind][]) {
			const r = readQuantity(quantityText(v, kind), kind);
			expect(r?.ok && r.value, `${v} as ${kind}`).toBe(v);
		}
	});
});

describe('quantity fields in zod schemas', () => {
	const forward = quantity('current', 'Rated forward current', (n) => n.positive('The rated forward current must be above zero.'));

	test('numbers pass as they are; text is read by the same parser as the form', () => {
		expect(forward.parse(0.2)).toBe(0.2);
		expect(forward.parse('200 mA')).toBe(0.2);
	});

	test('refusals say what was wrong in the words of the field', () => {
		const msg = (v: unknown) => forward.safeParse(v).error?.issues[0]?.message;
		expect(msg('200 mX')).toBe('Not read as a current: write it like 200 mA or 10p.');
		expect(msg('')).toBe('Rated forward current is required.');
		expect(msg(Number.POSITIVE_INFINITY)).toBe('Rated forward current: give a number.');
		expect(msg(true)).toBe('Rated forward current: give a number.');
		expect(msg('-1 mA')).toBe('The rated forward current must be above zero.');
	});

	test('an optional field may be left empty', () => {
		const opt = optionalQuantity('voltage', 'Rated reverse voltage');
		expect(opt.parse('')).toBeUndefined();
		expect(opt.parse('   ')).toBeUndefined();
		expect(opt.parse(undefined)).toBeUndefined();
		expect(opt.parse('75 V')).toBe(75);
	});
});

describe('the part form', () => {
	const form = (fields: Record<string, string>) => {
		const f = new FormData();
		for (const [k, v] of Object.entries({ partNumber: 'QX-1', maker: 'Quillmark Semi', kind: 'diode', ...fields })) f.set(k, v);
		return partInput.safeParse(partFromForm(f).candidate);
	};

	test('"200 mA" is 0.2 A, not 200 A', () => {
		const r = form({ forwardA: '200 mA', reverseV: '75 V', junctionC: '150 °C' });
		expect(r.success && r.data.ratings).toEqual({ forwardA: 0.2, reverseV: 75, junctionC: 150 });
	});

	test('errors sit on the field that holds them, in words', () => {
		const r = form({ forwardA: '200 mX', junctionC: '400 °C' });
		expect(r.success).toBe(false);
		expect(partFormErrors(r.error!)).toEqual({
			forwardA: 'Not read as a current: write it like 200 mA or 10p.',
			junctionC: 'The rated junction temperature must be 300 °C or less.'
		});
	});

	test('a kind the list does not hold is refused naming the kinds as the list shows them', () => {
		const r = form({ kind: 'zener' });
		expect(partFormErrors(r.error!).kind).toBe(
			'Choose the kind: PN diode, Schottky diode, BJT base–emitter, Diode-connected BJT, JFET gate junction, LED.'
		);
	});
});
