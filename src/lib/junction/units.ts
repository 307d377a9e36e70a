/**
 * Parsing and formatting of physical quantities the way people type them:
 * `10p`, `10 pA`, `−5V`, `612m`, `1e-12`, `85 °C`, `1 GΩ`, `10 meg`.
 *
 * Prefix rule for human input: lower-case `m` is milli, upper-case `M` and
 * `meg` (any case) are mega. SPICE cards use a different, case-insensitive
 * rule; see `parseSpiceNumber` in spice-card.ts.
 */
import { ZERO_CELSIUS_K } from './constants';

export type QuantityKind = 'voltage' | 'current' | 'resistance' | 'capacitance' | 'frequency' | 'number';

interface KindInfo {
	units: string[];
	example: string;
	noun: string;
}

const KIND_INFO: Record<QuantityKind, KindInfo> = {
	voltage: { units: ['v', 'volt', 'volts'], example: '-5 V or 612m', noun: 'a voltage' },
	current: { units: ['a', 'amp', 'amps', 'ampere', 'amperes'], example: '10 pA or 1e-12', noun: 'a current' },
	resistance: { units: ['ω', 'ω', 'ohm', 'ohms', 'r'], example: '10 Ω or 1 GΩ', noun: 'a resistance' },
	capacitance: { units: ['f', 'farad', 'farads'], example: '10 pF or 3.3n', noun: 'a capacitance' },
	frequency: { units: ['hz', 'hertz'], example: '1 kHz or 1 MHz', noun: 'a frequency' },
	number: { units: [], example: '1.5 or 2e-3', noun: 'a number' }
};

const PREFIX: Record<string, number> = {
	y: 1e-24,
	z: 1e-21,
	a: 1e-18,
	f: 1e-15,
	p: 1e-12,
	n: 1e-9,
	u: 1e-6,
	'µ': 1e-6, // U+00B5 micro sign
	'μ': 1e-6, // U+03BC Greek mu
	m: 1e-3,
	k: 1e3,
	K: 1e3,
	M: 1e6,
	G: 1e9,
	g: 1e9,
	T: 1e12,
	t: 1e12
};

/** Replace the typographic minus signs and spaces people paste with ASCII equivalents. */
function normalise(text: string): string {
	return text
		.replace(/[\u2212\u2012\u2013\u2014\uFE63\uFF0D]/g, '-')
		.replace(/[\u00A0\u2009\u202F]/g, ' ')
		.trim();
}

const NUMBER_RE = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;

function fail(kind: QuantityKind, text: string): never {
	const info = KIND_INFO[kind];
	throw new Error(`expected ${info.noun} such as ${info.example}, got '${text}'`);
}

/**
 * Parse a quantity with an optional SI prefix and optional unit symbol and
 * return its value in the base SI unit (V, A, Ω, F, Hz, or a plain number).
 * Examples: `parseQuantity('10 pA','current') = 1e-11`, `parseQuantity('612m','voltage') = 0.612`.
 * A decimal comma is accepted when it is the only separator (`0,612 V`).
 * @throws Error whose message says what was expected when the text is not understood.
 */
export function parseQuantity(text: string, kind: QuantityKind = 'number'): number {
	if (typeof text !== 'string') fail(kind, String(text));
	const s = normalise(text);
	const m = NUMBER_RE.exec(s);
	if (!m) fail(kind, text);
	const mantissa = m[1].replace(',', '.');
	const rest = m[2].trim();
	let scale = 1;
	const units = KIND_INFO[kind].units;
	const lower = rest.toLowerCase();
	const unitMatch = (r: string) => r === '' || units.includes(r.toLowerCase());
	if (rest === '') {
		scale = 1;
	} else if (lower.startsWith('meg') && unitMatch(rest.slice(3).trim())) {
		scale = 1e6;
	} else if (unitMatch(rest)) {
		scale = 1;
	} else if (rest[0] in PREFIX && unitMatch(rest.slice(1).trim())) {
		scale = PREFIX[rest[0]];
	} else {
		fail(kind, text);
	}
	const value = scaled(mantissa, scale);
	if (!Number.isFinite(value)) fail(kind, text);
	return value;
}

/**
 * `mantissa × scale` for a power-of-ten scale, rounded once: the prefix moves the decimal
 * exponent and the text is read as one decimal number, so `10f` is exactly the double
 * nearest 1e-14 (multiplying, 10 × 1e-15 = 1.0000000000000002e-14, rounds twice).
 */
function scaled(mantissa: string, scale: number): number {
	if (scale === 1) return Number(mantissa);
	const [coefficient, exponent = '0'] = mantissa.split(/e/i);
	return Number(`${coefficient}e${Number(exponent) + Math.round(Math.log10(scale))}`);
}

/** Parse a voltage in volts (`-5 V`, `−5V`, `612m`, `0.6`). @throws Error with an explanatory message. */
export function parseVoltage(text: string): number {
	return parseQuantity(text, 'voltage');
}

/** Parse a current in amperes (`10p`, `10 pA`, `1e-12`, `3 µA`). @throws Error with an explanatory message. */
export function parseCurrent(text: string): number {
	return parseQuantity(text, 'current');
}

/** Parse a resistance in ohms (`1G`, `1 GΩ`, `10 meg`, `4.7k ohm`). @throws Error with an explanatory message. */
export function parseResistance(text: string): number {
	return parseQuantity(text, 'resistance');
}

/** Parse a capacitance in farads (`10p`, `10 pF`). @throws Error with an explanatory message. */
export function parseCapacitance(text: string): number {
	return parseQuantity(text, 'capacitance');
}

/** Parse a frequency in hertz (`1 kHz`, `1 MHz`, `100k`). @throws Error with an explanatory message. */
export function parseFrequency(text: string): number {
	return parseQuantity(text, 'frequency');
}

/**
 * Parse a current-noise density in A/√Hz (`10 fA/√Hz`, `10f`, `3e-15 A/rtHz`): a current
 * with an optional per-root-hertz suffix (`/√Hz`, `/rtHz`, `/sqrt(Hz)`).
 * @throws Error with an explanatory message.
 */
export function parseNoiseDensity(text: string): number {
	const bare = typeof text === 'string' ? text.replace(/\s*\/\s*(√\(?\s*hz\s*\)?|rt\s*hz|sqrt\s*\(\s*hz\s*\))\s*$/i, '') : text;
	try {
		return parseCurrent(bare);
	} catch {
		throw new Error(`expected a noise density such as 10 fA/√Hz or 1e-14, got '${text}'`);
	}
}

export interface ParsedTemperature {
	/** Temperature in degrees Celsius. */
	celsius: number;
	/** Absolute temperature in kelvin. */
	kelvin: number;
	/** The scale the text was written in; bare numbers are read as °C and reported as 'C?'. */
	scale: 'C' | 'K' | 'C?';
}

/**
 * Parse a temperature typed as `85 °C`, `85C`, `85 degC`, `358.15 K` or a bare
 * number (read as °C, scale reported as 'C?'). Kelvin: T = t + 273.15 (exact by the
 * definition of the Celsius scale, BIPM SI Brochure, 9th ed., 2019, §2.3.1). The scale
 * the text was written in is returned as typed (`'25'` gives exactly 25 °C); only the
 * other one is converted.
 * @throws Error when the text is not a temperature or lies at or below absolute zero.
 */
export function parseTemperature(text: string): ParsedTemperature {
	const expected = `expected a temperature such as 85 °C or 358.15 K, got '${text}'`;
	if (typeof text !== 'string') throw new Error(expected);
	const s = normalise(text);
	const m = NUMBER_RE.exec(s);
	if (!m) throw new Error(expected);
	const value = Number(m[1].replace(',', '.'));
	const unit = m[2].trim().replace(/\s+/g, '').toLowerCase();
	let scale: ParsedTemperature['scale'];
	if (unit === '') scale = 'C?';
	else if (['°c', 'ºc', 'c', 'degc', 'deg', '°', 'celsius', '℃'].includes(unit)) scale = 'C';
	else if (['k', 'kelvin'].includes(unit)) scale = 'K';
	else throw new Error(expected);
	if (!Number.isFinite(value)) throw new Error(expected);
	const kelvin = scale === 'K' ? value : value + ZERO_CELSIUS_K;
	if (!(kelvin > 0)) throw new Error(`temperature '${text}' is at or below absolute zero`);
	return { celsius: scale === 'K' ? value - ZERO_CELSIUS_K : value, kelvin, scale };
}

const FORMAT_PREFIXES: [number, string][] = [
	[1e12, 'T'],
	[1e9, 'G'],
	[1e6, 'M'],
	[1e3, 'k'],
	[1, ''],
	[1e-3, 'm'],
	[1e-6, 'µ'],
	[1e-9, 'n'],
	[1e-12, 'p'],
	[1e-15, 'f'],
	[1e-18, 'a'],
	[1e-21, 'z'],
	[1e-24, 'y']
];

export interface FormatOptions {
	/** Significant figures (default 3). */
	digits?: number;
	/** Drop trailing zeros after the decimal point (default true), e.g. `3.2 fA` rather than `3.20 fA`. */
	trimZeros?: boolean;
}

/** Unicode minus sign used for display of negative values. */
export const MINUS = '\u2212';

/**
 * Format a value in base SI units with an SI prefix (BIPM SI Brochure, 9th ed., 2019,
 * Table 7, yocto … tera) and a unit symbol:
 * `formatSI(3.2e-15,'A') = '3.2 fA'`, `formatSI(0.612,'V') = '612 mV'`.
 * Magnitudes that round below 1 y (10⁻²⁴) are written in exponent form without a prefix,
 * `formatSI(3.2e-27,'A') = '3.2e−27 A'`, which `parseQuantity` reads back.
 * Negative values use the Unicode minus sign.
 * @throws RangeError when the value is not finite.
 */
export function formatSI(value: number, unit: string, options: FormatOptions = {}): string {
	if (!Number.isFinite(value)) throw new RangeError(`cannot format non-finite value ${value}`);
	const digits = options.digits ?? 3;
	if (!Number.isInteger(digits) || digits < 1 || digits > 15) throw new RangeError('digits must be an integer 1…15');
	const trim = options.trimZeros ?? true;
	const sep = unit ? ' ' : '';
	if (value === 0) return `0${sep}${unit}`;
	const sign = value < 0 ? MINUS : '';
	let mag = Math.abs(value);
	// Round first so that 999.96 mV becomes 1.00 V rather than 1000 mV.
	mag = Number(mag.toPrecision(digits));
	const smallest = FORMAT_PREFIXES[FORMAT_PREFIXES.length - 1];
	if (mag < smallest[0] * (1 - 1e-12)) {
		const [mant, exp] = mag.toExponential(digits - 1).split('e');
		const m = trim && mant.includes('.') ? mant.replace(/\.?0+$/, '') : mant;
		const e = Number(exp);
		return `${sign}${m}e${e < 0 ? MINUS : ''}${Math.abs(e)}${sep}${unit}`;
	}
	let chosen = smallest;
	for (const p of FORMAT_PREFIXES) {
		if (mag >= p[0] * (1 - 1e-12)) {
			chosen = p;
			break;
		}
	}
	const scaled = mag / chosen[0];
	const intDigits = Math.max(1, Math.floor(Math.log10(scaled)) + 1);
	let txt = scaled.toFixed(Math.max(0, digits - intDigits));
	if (trim && txt.includes('.')) txt = txt.replace(/\.?0+$/, '');
	return `${sign}${txt}${sep}${chosen[1]}${unit}`;
}

/**
 * Format a bias voltage with a fixed number of decimals (default 3) and the
 * Unicode minus: `formatBias(-5) = '−5.000 V'`.
 * @throws RangeError when the value is not finite.
 */
export function formatBias(volts: number, decimals = 3): string {
	if (!Number.isFinite(volts)) throw new RangeError(`cannot format non-finite bias ${volts}`);
	const txt = Math.abs(volts).toFixed(decimals);
	const isZero = Number(txt) === 0;
	return `${volts < 0 && !isZero ? MINUS : ''}${txt} V`;
}

/**
 * Format a temperature in °C: `formatTemperature(85) = '85 °C'`.
 * @throws RangeError when the value is not finite.
 */
export function formatTemperature(celsius: number, decimals = 1): string {
	if (!Number.isFinite(celsius)) throw new RangeError(`cannot format non-finite temperature ${celsius}`);
	let txt = Math.abs(celsius).toFixed(decimals);
	if (txt.includes('.')) txt = txt.replace(/\.?0+$/, '');
	return `${celsius < 0 && Number(txt) !== 0 ? MINUS : ''}${txt} °C`;
}
