/**
 * Quantity fields on forms: what a person typed ("200 mA", "-5 V", "85 °C", "10 meg") read
 * by the engine's parser (src/lib/junction/units.ts), the value it understood written back
 * the way the app writes numbers, or what could not be read, in words. The same reading
 * runs in the browser as the person types and on the server in the zod schemas
 * ($lib/schemas/quantity), so both say the same thing.
 */
import { formatSI, formatTemperature, parseQuantity, parseTemperature, type QuantityKind } from '$lib/junction/units';

export type FieldKind = Exclude<QuantityKind, 'number'> | 'temperature';

const UNIT: Record<Exclude<FieldKind, 'temperature'>, string> = { voltage: 'V', current: 'A', resistance: 'Ω', capacitance: 'F', frequency: 'Hz' };

/** How each kind is written, for hints and messages. */
export const FIELD_EXAMPLE: Record<FieldKind, string> = {
	voltage: '−5 V or 612 mV',
	current: '200 mA or 10p',
	resistance: '10 kΩ or 1 G',
	capacitance: '10 pF or 3.3n',
	frequency: '1 MHz or 100k',
	temperature: '85 °C or 358 K'
};

const NOUN: Record<FieldKind, string> = {
	voltage: 'a voltage',
	current: 'a current',
	resistance: 'a resistance',
	capacitance: 'a capacitance',
	frequency: 'a frequency',
	temperature: 'a temperature'
};

export type Reading = { ok: true; value: number; understood: string } | { ok: false; message: string };

/**
 * The value in base SI units (°C for temperatures) and the words for what was understood,
 * e.g. "200 mA = 0.2 A"; null for an empty field.
 */
export function readQuantity(text: string, kind: FieldKind): Reading | null {
	const typed = text.trim();
	if (!typed) return null;
	if (kind === 'temperature') {
		let celsius: number;
		try {
			celsius = parseTemperature(typed).celsius;
		} catch (e) {
			const below = /absolute zero/.test((e as Error).message);
			return { ok: false, message: below ? 'That is at or below absolute zero.' : notRead(kind) };
		}
		// Kelvin is converted (t = T − 273.15) and may carry a binary tail: 12 figures show it as typed.
		const value = Number(celsius.toPrecision(12));
		return { ok: true, value, understood: formatTemperature(value, 2) };
	}
	let value: number;
	try {
		value = parseQuantity(typed, kind);
	} catch {
		return { ok: false, message: notRead(kind) };
	}
	const pretty = exactSI(value, UNIT[kind]);
	const base = `${String(value).replace('-', '−')} ${UNIT[kind]}`;
	return { ok: true, value, understood: pretty === base || Math.abs(value) < 1e-3 || Math.abs(value) >= 1e4 ? pretty : `${pretty} = ${base}` };
}

function notRead(kind: FieldKind): string {
	return `Not read as ${NOUN[kind]}: write it like ${FIELD_EXAMPLE[kind]}.`;
}

/**
 * The value with an SI prefix and as few figures as give it back exactly, e.g. 0.2 → "200 mA",
 * 0.1234 → "123.4 mA": what an edit form shows, so saving unchanged changes nothing.
 */
export function exactSI(value: number, unit: string): string {
	for (let digits = 1; digits <= 15; digits++) {
		const text = formatSI(value, unit, { digits });
		if (parseQuantity(text, kindOfUnit(unit)) === value) return text;
	}
	return `${value} ${unit}`;
}

function kindOfUnit(unit: string): QuantityKind {
	const kind = (Object.keys(UNIT) as (keyof typeof UNIT)[]).find((k) => UNIT[k] === unit);
	return kind ?? 'number';
}

/** The text an edit form starts with for a stored value (empty when there is none). */
export function quantityText(value: number | null | undefined, kind: FieldKind): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '';
	return kind === 'temperature' ? formatTemperature(value, 2) : exactSI(value, UNIT[kind]);
}
