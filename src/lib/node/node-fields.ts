/**
 * The protected node as the screen's text fields (what a person types, SI prefixes welcome)
 * ↔ URL query ↔ the API's node. Pure: the page's load (the no-JavaScript path), the live
 * page and the save action all read it, so a node can be bookmarked and shared.
 *
 * Query names: rn/rv (rail name and voltage, repeated in order), guard (offset; empty = no
 * guard), slo/shi (signal range), tlo/thi (temperature or range), rs (source resistance),
 * fault (fault current, positive into the node), inet (allowed net current), verr (allowed
 * error voltage), noise (allowed noise density), vexc (allowed fault excursion), ja/jc/jp/jl
 * (junction anode, cathode, part number — empty for a candidate position — and label,
 * repeated in order), kind (repeated) and q (catalogue filters for the candidates), basis
 * (bound | worst | typical; left out for the default, bound) and by (net | noise: what a
 * ranking orders by; left out for net).
 */
import {
	formatSI,
	formatTemperature,
	NODE_PRESETS,
	parseCurrent,
	parseNoiseDensity,
	parseResistance,
	parseTemperature,
	parseVoltage,
	type NodePresetKey
} from '$lib/junction';
import { JUNCTION_KINDS, type JunctionKind } from '$lib/junction/names';
import { DEFAULT_BASIS, RANK_BASES, type RankBasis } from '$lib/junction/operating-point';
import { NODE_RANK_BY, type NodeRankBy } from '$lib/junction/node-rank';

export type RailRow = { name: string; volts: string };
/** `part` empty: a candidate position, filled by each catalogue part in turn. */
export type PositionRow = { anode: string; cathode: string; part: string; label: string };

export type NodeFields = {
	rails: RailRow[];
	guard: string;
	sigLo: string;
	sigHi: string;
	tLo: string;
	tHi: string;
	source: string;
	fault: string;
	maxNet: string;
	allowedError: string;
	maxNoise: string;
	maxExcursion: string;
	positions: PositionRow[];
	kinds: JunctionKind[];
	q: string;
	basis: RankBasis;
	by: NodeRankBy;
};

/** Errors keyed by field: `sigLo`, `rails.0.volts`, `positions.1.part`, … */
export type NodeFieldErrors = Record<string, string>;

type TextField = Exclude<keyof NodeFields, 'rails' | 'positions' | 'kinds' | 'basis' | 'by'>;
const TEXT_PARAMS: [TextField, string][] = [
	['guard', 'guard'],
	['sigLo', 'slo'],
	['sigHi', 'shi'],
	['tLo', 'tlo'],
	['tHi', 'thi'],
	['source', 'rs'],
	['fault', 'fault'],
	['maxNet', 'inet'],
	['allowedError', 'verr'],
	['maxNoise', 'noise'],
	['maxExcursion', 'vexc'],
	['q', 'q']
];

export function emptyNodeFields(): NodeFields {
	return {
		rails: [],
		guard: '',
		sigLo: '',
		sigHi: '',
		tLo: '',
		tHi: '',
		source: '',
		fault: '',
		maxNet: '',
		allowedError: '',
		maxNoise: '',
		maxExcursion: '',
		positions: [],
		kinds: [],
		q: '',
		basis: DEFAULT_BASIS,
		by: 'net'
	};
}

/** A preset's node as the fields show it (every position a candidate). */
export function presetFields(key: NodePresetKey): NodeFields {
	const p = NODE_PRESETS[key];
	return {
		...emptyNodeFields(),
		rails: Object.entries(p.rails).map(([name, v]) => ({ name, volts: formatSI(v, 'V') })),
		guard: p.guardOffsetV === undefined ? '' : formatSI(p.guardOffsetV, 'V'),
		sigLo: formatSI(p.signalRangeV[0], 'V'),
		sigHi: formatSI(p.signalRangeV[1], 'V'),
		tLo: formatTemperature(p.temperatureRangeC[0]),
		tHi: formatTemperature(p.temperatureRangeC[1]),
		source: p.sourceResistanceOhm === undefined ? '' : formatSI(p.sourceResistanceOhm, 'Ω'),
		fault: p.faultCurrentA === undefined ? '' : formatSI(p.faultCurrentA, 'A'),
		positions: p.junctions.map((j, i) => ({ anode: j.anode, cathode: j.cathode, part: '', label: `D${i + 1}` }))
	};
}

/** The fields in a query (missing ones empty). */
export function fieldsFromQuery(q: URLSearchParams): NodeFields {
	const f = emptyNodeFields();
	for (const [field, name] of TEXT_PARAMS) f[field] = q.get(name) ?? '';
	const rn = q.getAll('rn');
	const rv = q.getAll('rv');
	f.rails = rn.map((name, i) => ({ name, volts: rv[i] ?? '' }));
	const [ja, jc, jp, jl] = ['ja', 'jc', 'jp', 'jl'].map((n) => q.getAll(n));
	f.positions = ja.map((anode, i) => ({ anode, cathode: jc[i] ?? '', part: jp[i] ?? '', label: jl[i] ?? '' }));
	f.kinds = q.getAll('kind').filter((k): k is JunctionKind => (JUNCTION_KINDS as readonly string[]).includes(k));
	const basis = q.get('basis') ?? '';
	if ((RANK_BASES as readonly string[]).includes(basis)) f.basis = basis as RankBasis;
	const by = q.get('by') ?? '';
	if ((NODE_RANK_BY as readonly string[]).includes(by)) f.by = by as NodeRankBy;
	return f;
}

/** The query for the fields (empty text fields left out). */
export function queryFromFields(f: NodeFields): string {
	const q = new URLSearchParams();
	for (const r of f.rails) {
		q.append('rn', r.name);
		q.append('rv', r.volts);
	}
	for (const [field, name] of TEXT_PARAMS) if (f[field].trim()) q.set(name, f[field].trim());
	for (const p of f.positions) {
		q.append('ja', p.anode);
		q.append('jc', p.cathode);
		q.append('jp', p.part);
		q.append('jl', p.label);
	}
	for (const k of f.kinds) q.append('kind', k);
	if (f.basis !== DEFAULT_BASIS) q.set('basis', f.basis);
	if (f.by !== 'net') q.set('by', f.by);
	return q.toString();
}

/** A junction of a parsed node: a candidate position, or a part named by its number. */
export type ParsedPosition = { anode: string; cathode: string; label?: string; candidate?: true; partNumber?: string };

/** The node the fields describe, in API units, with fixed positions still named by part number. */
export type ParsedNode = {
	rails: Record<string, number>;
	guard?: { offsetV: number };
	signalRangeV: [number, number];
	temperatureC?: number;
	temperatureRangeC?: [number, number];
	sourceResistanceOhm?: number;
	faultCurrentA?: number;
	maxNetCurrentA?: number;
	allowedErrorV?: number;
	maxNoiseA_rtHz?: number;
	maxExcursionV?: number;
	basis?: RankBasis;
	junctions: ParsedPosition[];
};

function message(e: unknown): string {
	return e instanceof Error ? e.message.replace(/^expected/, 'Expected') : 'Not understood.';
}

/**
 * Reads the typed fields. Every problem is reported under its field; the network's own rules
 * (terminals, placements) are the schema's and the engine's, checked where the node is used.
 */
export function parseNodeFields(f: NodeFields): { node?: ParsedNode; errors: NodeFieldErrors } {
	const errors: NodeFieldErrors = {};
	const read = <T>(key: string, text: string, parse: (s: string) => T, required = false): T | undefined => {
		const t = text.trim();
		if (!t) {
			if (required) errors[key] = 'Required.';
			return undefined;
		}
		try {
			return parse(t);
		} catch (e) {
			errors[key] = message(e);
			return undefined;
		}
	};
	const rails: Record<string, number> = {};
	const named = new Set<string>();
	f.rails.forEach((r, i) => {
		const name = r.name.trim();
		if (!name) errors[`rails.${i}.name`] = 'Name the rail.';
		else if (named.has(name)) errors[`rails.${i}.name`] = `Another rail is already called “${name}”.`;
		named.add(name);
		const v = read(`rails.${i}.volts`, r.volts, parseVoltage, true);
		if (name && v !== undefined) rails[name] = v;
	});
	const guard = read('guard', f.guard, parseVoltage);
	const lo = read('sigLo', f.sigLo, parseVoltage, true);
	const hi = read('sigHi', f.sigHi, parseVoltage, true);
	if (lo !== undefined && hi !== undefined && lo > hi) errors.sigHi = 'The high end of the signal range is below the low end.';
	const tLo = read('tLo', f.tLo, (s) => parseTemperature(s).celsius);
	const tHi = read('tHi', f.tHi, (s) => parseTemperature(s).celsius, true);
	if (tLo !== undefined && tHi !== undefined && tLo > tHi) errors.tHi = 'The hot end is below the cold end.';
	const source = read('source', f.source, parseResistance);
	const fault = read('fault', f.fault, parseCurrent);
	if (fault === 0) errors.fault = 'A fault current of zero is no fault; leave the box empty.';
	const maxNet = read('maxNet', f.maxNet, parseCurrent);
	const allowedError = read('allowedError', f.allowedError, parseVoltage);
	const maxNoise = read('maxNoise', f.maxNoise, parseNoiseDensity);
	const maxExcursion = read('maxExcursion', f.maxExcursion, parseVoltage);
	for (const [key, v] of [['maxNet', maxNet], ['allowedError', allowedError], ['maxNoise', maxNoise], ['maxExcursion', maxExcursion], ['source', source]] as const)
		if (v !== undefined && !(v > 0)) errors[key] = 'Give a value above zero.';
	if (allowedError !== undefined && source === undefined) errors.allowedError ??= 'An allowed error voltage needs the source resistance.';
	if (maxExcursion !== undefined && fault === undefined) errors.maxExcursion ??= 'An excursion limit needs the fault current.';
	if (f.positions.length === 0) errors.positions = 'Place at least one junction.';
	const junctions = f.positions.map((p, i): ParsedPosition => {
		if (!p.anode.trim()) errors[`positions.${i}.anode`] = 'Choose where the anode goes.';
		if (!p.cathode.trim()) errors[`positions.${i}.cathode`] = 'Choose where the cathode goes.';
		const part = p.part.trim();
		return { anode: p.anode.trim(), cathode: p.cathode.trim(), ...(p.label.trim() ? { label: p.label.trim() } : {}), ...(part ? { partNumber: part } : { candidate: true }) };
	});
	if (Object.keys(errors).length) return { errors };
	return {
		errors,
		node: {
			rails,
			...(guard !== undefined ? { guard: { offsetV: guard } } : {}),
			signalRangeV: [lo as number, hi as number],
			...(tLo !== undefined ? { temperatureRangeC: [tLo, tHi as number] as [number, number] } : { temperatureC: tHi }),
			...(source !== undefined ? { sourceResistanceOhm: source } : {}),
			...(fault !== undefined ? { faultCurrentA: fault } : {}),
			...(maxNet !== undefined ? { maxNetCurrentA: maxNet } : {}),
			...(allowedError !== undefined ? { allowedErrorV: allowedError } : {}),
			...(maxNoise !== undefined ? { maxNoiseA_rtHz: maxNoise } : {}),
			...(maxExcursion !== undefined ? { maxExcursionV: maxExcursion } : {}),
			...(f.basis !== DEFAULT_BASIS ? { basis: f.basis } : {}),
			junctions
		}
	};
}

/**
 * The field an API issue path belongs to: `junctions.1.cathode` → `positions.1.cathode`,
 * `rails.VPOS` → the row of that rail, `guard.offsetV` → `guard`, `signalRangeV` → `sigLo` …
 */
export function fieldOfIssue(path: string, f: NodeFields): string {
	const parts = path.split('.');
	if (parts[0] === 'junctions') return parts.length > 1 ? `positions.${parts[1]}${parts[2] && ['anode', 'cathode'].includes(parts[2]) ? `.${parts[2]}` : parts[2] ? '.part' : ''}` : 'positions';
	if (parts[0] === 'rails') {
		const i = f.rails.findIndex((r) => r.name.trim() === parts[1]);
		return i >= 0 ? `rails.${i}.name` : 'rails';
	}
	const map: Record<string, string> = {
		guard: 'guard',
		signalRangeV: 'sigLo',
		temperatureC: 'tHi',
		temperatureRangeC: 'tHi',
		sourceResistanceOhm: 'source',
		faultCurrentA: 'fault',
		maxNetCurrentA: 'maxNet',
		allowedErrorV: 'allowedError',
		maxNoiseA_rtHz: 'maxNoise',
		maxExcursionV: 'maxExcursion',
		basis: 'basis'
	};
	return map[parts[0]] ?? 'form';
}

/**
 * A row edit asked for by the form's buttons (without JavaScript they submit it as `edit`):
 * `add-rail`, `add-junction`, `drop-rail-N`, `drop-junction-N`. Unknown edits change nothing.
 */
export function applyEdit(f: NodeFields, edit: string | null): NodeFields {
	if (!edit) return f;
	const out: NodeFields = { ...f, rails: f.rails.map((r) => ({ ...r })), positions: f.positions.map((p) => ({ ...p })) };
	if (edit === 'add-rail') out.rails.push({ name: `V${out.rails.length + 1}`, volts: '' });
	else if (edit === 'add-junction') out.positions.push({ anode: 'node', cathode: out.rails[0]?.name ?? (out.guard.trim() ? 'guard' : ''), part: '', label: `D${out.positions.length + 1}` });
	else {
		const m = /^drop-(rail|junction)-(\d+)$/.exec(edit);
		if (m) (m[1] === 'rail' ? out.rails : out.positions).splice(Number(m[2]), 1);
	}
	return out;
}

/** The fields showing a saved node (fixed positions by their part number, as `partNumberOf` gives it). */
export function fieldsFromNode(
	n: Omit<ParsedNode, 'junctions'> & { junctions: { anode: string; cathode: string; id?: number; label?: string; candidate?: boolean }[] },
	partNumberOf: (id: number) => string
): NodeFields {
	const opt = (v: number | undefined, unit: string) => (v === undefined ? '' : formatSI(v, unit, { digits: 6 }));
	return {
		...emptyNodeFields(),
		rails: Object.entries(n.rails).map(([name, v]) => ({ name, volts: formatSI(v, 'V', { digits: 6 }) })),
		guard: opt(n.guard?.offsetV, 'V'),
		sigLo: formatSI(n.signalRangeV[0], 'V', { digits: 6 }),
		sigHi: formatSI(n.signalRangeV[1], 'V', { digits: 6 }),
		tLo: n.temperatureRangeC ? formatTemperature(n.temperatureRangeC[0], 3) : '',
		tHi: formatTemperature(n.temperatureRangeC ? n.temperatureRangeC[1] : (n.temperatureC ?? 25), 3),
		source: opt(n.sourceResistanceOhm, 'Ω'),
		fault: opt(n.faultCurrentA, 'A'),
		maxNet: opt(n.maxNetCurrentA, 'A'),
		allowedError: opt(n.allowedErrorV, 'V'),
		maxNoise: n.maxNoiseA_rtHz === undefined ? '' : `${formatSI(n.maxNoiseA_rtHz, 'A', { digits: 6 })}/√Hz`,
		maxExcursion: opt(n.maxExcursionV, 'V'),
		basis: n.basis ?? DEFAULT_BASIS,
		positions: n.junctions.map((j) => ({ anode: j.anode, cathode: j.cathode, part: j.id !== undefined ? partNumberOf(j.id) : '', label: j.label ?? '' }))
	};
}
