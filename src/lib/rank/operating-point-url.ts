/**
 * The operating point as text fields (what a person types) ↔ URL query ↔ API operating
 * point. Pure: used by the page's load function (no-JavaScript path), the live page and
 * the compare page, so a ranking can be bookmarked and shared.
 *
 * Query names: v (bias), tlo/thi (temperature or range), ic (clamp current), vf (max
 * forward drop), margin (reverse-rating margin), over=1 (list parts over the rating),
 * rs (source resistance), verr (allowed error voltage), ileak (allowed leakage),
 * cmax (capacitance limit), nmax (current-noise limit, A/√Hz), kind (repeated), pkg (comma-separated), life (repeated), q,
 * basis (bound | worst | typical; left out for the default, bound), cov and conf (the
 * bound's coverage and confidence, as typed: "95 %" or "0.95").
 */
import { parseNoiseDensity, parseQuantity, parseTemperature, type QuantityKind } from '$lib/junction';
import {
	DEFAULT_BASIS,
	operatingPointSchema,
	RANK_BASES,
	RANK_KINDS,
	type RankBasis,
	RANK_LIFECYCLES,
	type RankKind,
	type RankLifecycle,
	type RankOperatingPoint
} from '$lib/schemas/rank';

export type OpFields = {
	bias: string;
	tLo: string;
	tHi: string;
	clamp: string;
	maxDrop: string;
	margin: string;
	overRating: boolean;
	source: string;
	allowedError: string;
	leakage: string;
	maxCap: string;
	maxNoise: string;
	kinds: RankKind[];
	packages: string;
	lifecycles: RankLifecycle[];
	q: string;
	basis: RankBasis;
	coverage: string;
	confidence: string;
};

export type FieldName = keyof OpFields;
export type FieldErrors = Partial<Record<FieldName, string>>;

/** What /rank shows before anyone types: a reverse-biased clamp on a warm board. */
export const DEFAULT_FIELDS: OpFields = {
	bias: '-5',
	tLo: '25',
	tHi: '85',
	clamp: '1m',
	maxDrop: '0.7',
	margin: '',
	overRating: false,
	source: '',
	allowedError: '',
	leakage: '',
	maxCap: '',
	maxNoise: '',
	kinds: [],
	packages: '',
	lifecycles: [],
	q: '',
	basis: DEFAULT_BASIS,
	coverage: '',
	confidence: ''
};

export function emptyFields(): OpFields {
	return { ...DEFAULT_FIELDS, bias: '', tLo: '', tHi: '', clamp: '', maxDrop: '', kinds: [], lifecycles: [] };
}

const TEXT_PARAMS: [Exclude<FieldName, 'overRating' | 'kinds' | 'lifecycles' | 'basis'>, string][] = [
	['bias', 'v'],
	['tLo', 'tlo'],
	['tHi', 'thi'],
	['clamp', 'ic'],
	['maxDrop', 'vf'],
	['margin', 'margin'],
	['source', 'rs'],
	['allowedError', 'verr'],
	['leakage', 'ileak'],
	['maxCap', 'cmax'],
	['maxNoise', 'nmax'],
	['packages', 'pkg'],
	['q', 'q'],
	['coverage', 'cov'],
	['confidence', 'conf']
];

/** A field's query parameter, for messages about an address (`v`, `thi`, …). */
export const FIELD_PARAM: Partial<Record<FieldName, string>> = Object.fromEntries(TEXT_PARAMS);

/** Query parameter names the operating point uses (others, e.g. ids, are left alone). */
export const OP_PARAM_NAMES = [...TEXT_PARAMS.map(([, p]) => p), 'over', 'kind', 'life', 'basis'];

/** Reads fields from a query; an empty query (no v and no temperature) gives the defaults. */
export function fieldsFromQuery(params: URLSearchParams): OpFields {
	if (!params.has('v') && !params.has('thi') && !params.has('tlo')) return { ...DEFAULT_FIELDS, kinds: [], lifecycles: [] };
	const f = emptyFields();
	for (const [field, name] of TEXT_PARAMS) f[field] = (params.get(name) ?? '').trim();
	f.overRating = params.get('over') === '1' || params.get('over') === 'on';
	f.kinds = params.getAll('kind').filter((k): k is RankKind => (RANK_KINDS as readonly string[]).includes(k));
	f.lifecycles = params.getAll('life').filter((k): k is RankLifecycle => (RANK_LIFECYCLES as readonly string[]).includes(k));
	const basis = params.get('basis');
	f.basis = (RANK_BASES as readonly string[]).includes(basis ?? '') ? (basis as RankBasis) : DEFAULT_BASIS;
	return f;
}

/** Writes fields to a query, leaving empty ones out. */
export function queryFromFields(f: OpFields): URLSearchParams {
	const p = new URLSearchParams();
	for (const [field, name] of TEXT_PARAMS) {
		const v = f[field].trim();
		if (v) p.set(name, v);
	}
	if (f.overRating) p.set('over', '1');
	for (const k of f.kinds) p.append('kind', k);
	for (const l of f.lifecycles) p.append('life', l);
	if (f.basis !== DEFAULT_BASIS) p.set('basis', f.basis);
	return p;
}

const PREFIXES: [string, number][] = [
	['', 1],
	['m', 1e-3],
	['u', 1e-6],
	['n', 1e-9],
	['p', 1e-12],
	['f', 1e-15],
	['a', 1e-18],
	['k', 1e3],
	['M', 1e6],
	['G', 1e9],
	['T', 1e12]
];

/** A value to the 12 significant figures the sentence keeps (float noise beyond them is dropped). */
const twelve = (v: number) => Number(v.toPrecision(12));

/**
 * Canonical short text for a value, which the unit parser reads back as the value to 12
 * significant figures: 1e-3 → "1m", 1e10 → "10G", -5 → "-5", and 1.0000000000000002e-14
 * (10 fA after a multiplication) → "10f", never the float's noise. Among equally short texts
 * the engineering form (mantissa 1…999) wins; JavaScript's own form is the fallback.
 */
export function compactNumber(value: number, kind: QuantityKind = 'number'): string {
	if (!Number.isFinite(value) || value === 0) return String(value);
	const target = twelve(value);
	let best = String(target);
	let bestEngineering = false;
	for (const [prefix, scale] of PREFIXES) {
		const mant = value / scale;
		for (const digits of [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]) {
			const mantissa = String(Number(mant.toPrecision(digits)));
			if (prefix && mantissa.includes('e')) break; // "1e-24G" is no one's way of writing it
			const txt = mantissa + prefix;
			let back: number;
			try {
				back = parseQuantity(txt, kind);
			} catch {
				break;
			}
			if (twelve(back) !== target) continue;
			// Equally short: the engineering form (1 ≤ mantissa < 1000) is the canonical one.
			const engineering = Math.abs(mant) >= 1 && Math.abs(mant) < 1000;
			if (txt.length < best.length || (txt.length === best.length && engineering && !bestEngineering)) {
				best = txt;
				bestEngineering = engineering;
			}
			break;
		}
	}
	return best;
}

/** The fields that write exactly this operating point. */
export function fieldsFromOperatingPoint(op: RankOperatingPoint): OpFields {
	const f = emptyFields();
	const num = (v: number | undefined, kind: QuantityKind) => (v === undefined ? '' : compactNumber(v, kind));
	// Kelvin round trips can leave a last-digit wobble in a stored °C; 12 figures write what was typed.
	const celsius = (t: number) => String(Number(t.toPrecision(12)));
	f.bias = num(op.biasV, 'voltage');
	if (op.temperatureRangeC) {
		f.tLo = celsius(op.temperatureRangeC[0]);
		f.tHi = celsius(op.temperatureRangeC[1]);
	} else if (op.temperatureC !== undefined) {
		f.tHi = celsius(op.temperatureC);
	}
	f.clamp = num(op.clampCurrentA, 'current');
	f.maxDrop = num(op.maxForwardDropV, 'voltage');
	f.margin = num(op.reverseMarginV, 'voltage');
	f.overRating = op.includeOverRating ?? false;
	f.source = num(op.sourceResistanceOhm, 'resistance');
	f.allowedError = num(op.allowedErrorV, 'voltage');
	f.leakage = num(op.leakageTargetA, 'current');
	f.maxCap = num(op.maxCapacitanceF, 'capacitance');
	// A noise density is typed as a current per root hertz; the bare current reads back the same.
	f.maxNoise = num(op.maxNoiseA_rtHz, 'current');
	f.kinds = [...(op.kinds ?? [])];
	f.lifecycles = [...(op.lifecycles ?? [])];
	f.packages = (op.packages ?? []).join(', ');
	f.q = op.q ?? '';
	f.basis = op.basis ?? DEFAULT_BASIS;
	f.coverage = op.coverage === undefined ? '' : String(op.coverage);
	f.confidence = op.confidence === undefined ? '' : String(op.confidence);
	return f;
}

export function queryFromOperatingPoint(op: RankOperatingPoint): URLSearchParams {
	return queryFromFields(fieldsFromOperatingPoint(op));
}

/**
 * °C from a typed temperature. The unit parser goes through kelvin (t + 273.15 − 273.15),
 * which can move the last binary digit; 12 significant figures give back what was typed.
 */
function celsiusOf(text: string): number {
	return Number(parseTemperature(text).celsius.toPrecision(12));
}

/** The schema's field paths → the text field that holds them. */
const PATH_FIELD: Record<string, FieldName> = {
	biasV: 'bias',
	temperatureC: 'tHi',
	temperatureRangeC: 'tLo',
	clampCurrentA: 'clamp',
	maxForwardDropV: 'maxDrop',
	reverseMarginV: 'margin',
	sourceResistanceOhm: 'source',
	allowedErrorV: 'allowedError',
	leakageTargetA: 'leakage',
	maxCapacitanceF: 'maxCap',
	maxNoiseA_rtHz: 'maxNoise',
	packages: 'packages',
	q: 'q',
	kinds: 'kinds',
	lifecycles: 'lifecycles',
	basis: 'basis',
	coverage: 'coverage',
	confidence: 'confidence'
};

/**
 * A fraction as a person types it: "95 %", "95" or "0.95" are all 0.95 (a number above 1
 * or with a % sign is a percentage). Rounded to 12 significant figures, so 99.9 % is 0.999.
 * @throws Error naming what was expected.
 */
export function parseFraction(text: string): number {
	const m = /^\s*([0-9]*\.?[0-9]+)\s*(%?)\s*$/.exec(text);
	if (!m) throw new Error('expected a fraction such as 0.95 or 95 %');
	const v = Number(m[1]);
	return Number((m[2] === '%' || v > 1 ? v / 100 : v).toPrecision(12));
}

/**
 * The schema's API names as the ranking sentence says them. The schema's messages serve the
 * HTTP API, whose callers know the keys; the screen shows them in its own words.
 */
const PATH_WORDS: [RegExp, string][] = [
	[/\btemperatureC or temperatureRangeC: \[low, high\]/g, 'one temperature or a range'],
	[/\btemperatureRangeC\[0\]/g, 'the lowest temperature'],
	[/\btemperatureRangeC\[1\]/g, 'the highest temperature'],
	[/\btemperatureRangeC must be \[low, high\] with low ≤ high/g, 'the lowest temperature must not be above the highest'],
	[/\btemperatureC\b/g, 'the temperature'],
	[/\bbiasV\b/g, 'the bias'],
	[/\bclampCurrentA\b/g, 'the clamp current'],
	[/\bmaxForwardDropV\b/g, 'the largest forward drop'],
	[/\breverseMarginV\b/g, 'the margin below the reverse rating'],
	[/\bsourceResistanceOhm\b/g, 'the source resistance'],
	[/\ballowedErrorV\b/g, 'the allowed error voltage'],
	[/\bleakageTargetA\b/g, 'the allowed leakage'],
	[/\bmaxCapacitanceF\b/g, 'the largest capacitance'],
	[/\bcoverage\b/g, 'the coverage'],
	[/\bconfidence\b/g, 'the confidence']
];

/** A schema message with every API name replaced by the screen's words, as a sentence. */
export function screenMessage(message: string): string {
	let out = message;
	for (const [re, words] of PATH_WORDS) out = out.replace(re, words);
	out = out.charAt(0).toUpperCase() + out.slice(1);
	return /[.!?]$/.test(out) ? out : `${out}.`;
}

/** Reads one field at a time, keeping the first problem of each field in `errors`. */
function fieldReader(f: OpFields, errors: FieldErrors) {
	/** The value read from the text, or undefined with the reader's message as the field's error. */
	const attempt = <T>(field: FieldName, read: () => T): T | undefined => {
		try {
			return read();
		} catch (e) {
			errors[field] = (e as Error).message;
			return undefined;
		}
	};
	const quantity = (field: FieldName, kind: QuantityKind, required = false): number | undefined => {
		const text = String(f[field]).trim();
		if (!text) {
			if (required) errors[field] = 'required';
			return undefined;
		}
		// 12 significant figures: "10f" is 10 fA, not the 1.0000000000000002e-14 that 10 × 1e-15 makes.
		return attempt(field, () => twelve(parseQuantity(text, kind)));
	};
	return { attempt, quantity };
}

/** The temperature or range: two boxes, or a range typed into the high one ("−40…85"). */
function readTemperatures(f: OpFields, read: ReturnType<typeof fieldReader>, errors: FieldErrors, op: Record<string, unknown>): void {
	const box = (field: 'tLo' | 'tHi') => (f[field].trim() ? read.attempt(field, () => celsiusOf(f[field].trim())) : undefined);
	let lo = box('tLo');
	let hi: number | undefined;
	const rangeInHi = /^(.+?)\s*(?:\.\.|…|\bto\b)\s*(.+)$/.exec(f.tHi.trim());
	if (rangeInHi && !f.tLo.trim()) {
		const both = read.attempt('tHi', () => [celsiusOf(rangeInHi[1]), celsiusOf(rangeInHi[2])]);
		if (both) [lo, hi] = both;
	} else hi = box('tHi');
	if (hi === undefined && !errors.tHi) errors.tHi = 'required';
	if (lo !== undefined && hi !== undefined) {
		if (lo > hi) errors.tLo = 'the low end must not be above the high end';
		op.temperatureRangeC = [lo, hi];
	} else if (hi !== undefined) op.temperatureC = hi;
}

/** The optional limits, with the quantity each field holds. */
const OPTIONAL_LIMITS: [FieldName, string, QuantityKind][] = [
	['clamp', 'clampCurrentA', 'current'],
	['maxDrop', 'maxForwardDropV', 'voltage'],
	['margin', 'reverseMarginV', 'voltage'],
	['source', 'sourceResistanceOhm', 'resistance'],
	['allowedError', 'allowedErrorV', 'voltage'],
	['leakage', 'leakageTargetA', 'current'],
	['maxCap', 'maxCapacitanceF', 'capacitance']
];

/** Which parts are listed and how they are ranked: filters, basis and the bound's coverage and confidence. */
function readSelection(f: OpFields, read: ReturnType<typeof fieldReader>, op: Record<string, unknown>): void {
	if (f.overRating) op.includeOverRating = true;
	if (f.kinds.length) op.kinds = [...f.kinds];
	if (f.lifecycles.length) op.lifecycles = [...f.lifecycles];
	const pk = f.packages
		.split(',')
		.map((s) => s.trim())
		.filter(Boolean);
	if (pk.length) op.packages = pk;
	if (f.q.trim()) op.q = f.q.trim();
	if (f.basis !== DEFAULT_BASIS) op.basis = f.basis;
	for (const field of ['coverage', 'confidence'] as const) {
		const text = f[field].trim();
		const v = text ? read.attempt(field, () => parseFraction(text)) : undefined;
		if (v !== undefined) op[field] = v;
	}
}

/**
 * Parses the fields with the engine's unit parser. Returns the operating point when every
 * field is valid, and an error per field otherwise (messages say what was expected).
 */
export function parseFields(f: OpFields): { op: RankOperatingPoint | null; errors: FieldErrors } {
	const errors: FieldErrors = {};
	const read = fieldReader(f, errors);
	const op: Record<string, unknown> = {};
	op.biasV = read.quantity('bias', 'voltage', true);
	readTemperatures(f, read, errors, op);
	for (const [field, key, kind] of OPTIONAL_LIMITS) {
		const v = read.quantity(field, kind);
		if (v !== undefined) op[key] = v;
	}
	if (f.maxNoise.trim()) {
		const v = read.attempt('maxNoise', () => parseNoiseDensity(f.maxNoise));
		if (v !== undefined) op.maxNoiseA_rtHz = v;
	}
	readSelection(f, read, op);
	if (Object.keys(errors).length) return { op: null, errors };
	const checked = operatingPointSchema.safeParse(op);
	if (!checked.success) {
		for (const issue of checked.error.issues) {
			const field = PATH_FIELD[String(issue.path[0] ?? 'biasV')] ?? 'bias';
			errors[field] ??= screenMessage(issue.message);
		}
		return { op: null, errors };
	}
	return { op: checked.data, errors };
}

/** Query string → operating point (null with errors when a field is invalid). */
export function operatingPointFromQuery(params: URLSearchParams) {
	return parseFields(fieldsFromQuery(params));
}
