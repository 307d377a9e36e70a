// Reading part, sample, temperature and sweep direction out of a bench file's name with an
// editable pattern such as {part}_{sample}_{temperature}. Pure, for the screen's live preview
// and for scripts.
import { parseTemperature } from '../junction/units';

export const DEFAULT_PATTERN = '{part}_{sample}_{temperature}';
const PATTERN_FIELDS = ['part', 'sample', 'temperature', 'direction', 'skip'] as const;
export type PatternField = (typeof PATTERN_FIELDS)[number];
export type Direction = 'forward' | 'reverse' | 'both';

export type NameFields = { part: string; sample: string; temperatureC: number; direction: Direction | null };
export type NameReading = { ok: true; fields: NameFields } | { ok: false; reason: string };
export type CompiledPattern = { ok: true; regex: RegExp; fields: PatternField[] } | { ok: false; reason: string };

const DIRECTION_WORDS: Record<string, Direction> = { fwd: 'forward', forward: 'forward', f: 'forward', rev: 'reverse', reverse: 'reverse', r: 'reverse', both: 'both', fr: 'both' };
const DIRECTION_RE = '(fwd|forward|rev|reverse|both|fr|f|r)';
const PIECE: Record<PatternField, string> = {
	part: '(.+?)',
	sample: '([A-Za-z0-9.#-]+?)',
	// 85C, -40C, m40C (minus written as m), 25.5C, 25p5C, 358.15K, 85degC
	temperature: '([+-]?m?\\d+(?:[.p]\\d+)?\\s*(?:°?C|degC|K))',
	direction: DIRECTION_RE,
	skip: '(.*?)'
};
const escape = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * Compiles a pattern: {part}, {sample} and {temperature} must appear once each; {direction}
 * and {skip} may. Without {direction}, an optional direction word after a separator is still
 * read (QVL-D9_S2_85C_rev). Matching ignores case and the file's extension and folders.
 */
export function compilePattern(pattern: string): CompiledPattern {
	const fields: PatternField[] = [];
	let source = '';
	let last = 0;
	for (const m of pattern.matchAll(/\{([^}]*)\}/g)) {
		const name = m[1].trim().toLowerCase() as PatternField;
		if (!PATTERN_FIELDS.includes(name)) return { ok: false, reason: `{${m[1]}} is not a field; use ${PATTERN_FIELDS.map((f) => `{${f}}`).join(', ')}` };
		if (name !== 'skip' && fields.includes(name)) return { ok: false, reason: `{${name}} appears twice` };
		source += escape(pattern.slice(last, m.index)) + PIECE[name];
		fields.push(name);
		last = m.index! + m[0].length;
	}
	source += escape(pattern.slice(last));
	for (const need of ['part', 'sample', 'temperature'] as const) if (!fields.includes(need)) return { ok: false, reason: `the pattern needs {${need}}` };
	if (!fields.includes('direction')) {
		source += `(?:[_ .-]${DIRECTION_RE})?`;
		fields.push('direction');
	}
	return { ok: true, regex: new RegExp(`^${source}$`, 'i'), fields };
}

/** The name without folders and without its extension (.csv, .txt, .dat …). */
export function baseName(path: string): string {
	const name = path.split(/[\\/]/).pop() ?? path;
	return name.replace(/\.[A-Za-z0-9]{1,5}$/, '');
}

/** °C from a name's temperature: 85C, -40C, m40C, 25p5C, 358.15K. @throws Error when out of reach. */
function nameTemperature(text: string): number {
	const t = text.replace(/\s/g, '').replace(/^m/i, '-').replace(/(\d)p(\d)/i, '$1.$2').replace(/degc$/i, 'C');
	return parseTemperature(t).celsius;
}

/** Reads one file name with a compiled pattern; the reason says what did not fit. */
export function readName(path: string, compiled: CompiledPattern): NameReading {
	if (!compiled.ok) return { ok: false, reason: compiled.reason };
	const name = baseName(path);
	const m = compiled.regex.exec(name);
	if (!m) return { ok: false, reason: `“${name}” does not fit the pattern` };
	const got: Partial<Record<PatternField, string>> = {};
	compiled.fields.forEach((f, k) => {
		if (m[k + 1] !== undefined && f !== 'skip') got[f] = m[k + 1];
	});
	let temperatureC: number;
	try {
		temperatureC = nameTemperature(got.temperature!);
	} catch {
		return { ok: false, reason: `the temperature “${got.temperature}” cannot be read` };
	}
	if (temperatureC < -70 || temperatureC > 200) return { ok: false, reason: `${temperatureC} °C is outside −70 … 200 °C` };
	return { ok: true, fields: { part: got.part!, sample: got.sample!, temperatureC, direction: got.direction ? DIRECTION_WORDS[got.direction.toLowerCase()] : null } };
}

const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');

/** Finds the part a name's {part} means: equal ignoring case and punctuation; two candidates are ambiguous. */
export function matchPart<P extends { pn: string; mk: string }>(part: string, parts: P[]): { ok: true; part: P } | { ok: false; reason: string } {
	const key = squash(part);
	const hits = parts.filter((p) => squash(p.pn) === key);
	if (hits.length === 1) return { ok: true, part: hits[0] };
	if (!hits.length) return { ok: false, reason: `no part “${part}” in the catalogue` };
	return { ok: false, reason: `“${part}” matches ${hits.map((h) => `${h.mk} ${h.pn}`).join(' and ')}; rename the file with the exact part number` };
}
