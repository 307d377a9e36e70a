/**
 * SPICE `.model` cards for junction models: parsing and emitting.
 *
 * Accepted syntax (case-insensitive): `.model NAME D (IS=1e-14 N=1.05 RS=0.5)`,
 * parentheses optional, `+` continuation lines, `*` comment lines, `;` trailing
 * comments, spaces or commas between parameters, SPICE scale suffixes
 * (f p n u m k meg g t mil) and trailing unit letters (`10pA`, `0.7V`).
 * Parameter aliases as SPICE accepts them: CJ0/CJ → CJO, PB → VJ, MJ → M.
 * RSH and RSHF (shunt factor per 10 K) are this catalogue's extensions; emit with
 * `{ forSimulator: true }` to leave them out of a card meant for a simulator.
 */
import { createModel, type JunctionMaterial, type JunctionModel, type JunctionModelInput } from './model';

const SUFFIX: [string, number][] = [
	['meg', 1e6],
	['mil', 25.4e-6],
	['t', 1e12],
	['g', 1e9],
	['k', 1e3],
	['m', 1e-3],
	['u', 1e-6],
	['µ', 1e-6],
	['n', 1e-9],
	['p', 1e-12],
	['f', 1e-15]
];

/**
 * Parse a number written with SPICE rules: `10p` = 1e-11, `2.2MEG` = 2.2e6, `3M` = 3e-3
 * (SPICE reads M as milli), `0.7V` = 0.7 (unit letters after a scale letter are ignored).
 * @throws Error naming what was expected when the text is not a SPICE number.
 */
export function parseSpiceNumber(text: string): number {
	const m = /^\s*([+-]?(?:\d+\.?\d*|\.\d+)(?:e[+-]?\d+)?)([a-zµ]*)\s*$/i.exec(text);
	if (!m) throw new Error(`expected a SPICE number such as 1e-14, 10p or 2.2meg, got '${text}'`);
	const base = Number(m[1]);
	const tail = m[2].toLowerCase();
	let scale = 1;
	for (const [s, f] of SUFFIX) {
		if (tail.startsWith(s)) {
			scale = f;
			break;
		}
	}
	const v = base * scale;
	if (!Number.isFinite(v)) throw new Error(`SPICE number '${text}' is out of range`);
	return v;
}

/** Canonical parameter names the engine understands, with accepted aliases. */
const KNOWN: Record<string, keyof JunctionModel> = {
	is: 'IS',
	n: 'N',
	rs: 'RS',
	rsh: 'RSH',
	isr: 'ISR',
	nr: 'NR',
	bv: 'BV',
	ibv: 'IBV',
	nbv: 'NBV',
	eg: 'EG',
	xti: 'XTI',
	tnom: 'TNOM',
	tref: 'TNOM',
	cjo: 'CJO',
	cj0: 'CJO',
	cj: 'CJO',
	vj: 'VJ',
	pb: 'VJ',
	m: 'M',
	mj: 'M',
	fc: 'FC',
	rshf: 'shuntFactorPer10K'
};

export interface ParsedModelCard {
	name: string;
	/** Device type letter(s) as written, upper-cased (normally 'D'). */
	type: string;
	model: JunctionModel;
	/** Canonical names of the parameters the card actually gave. */
	given: string[];
	/** Parameters the engine does not use, kept verbatim so nothing is lost. */
	unknown: { name: string; value: string }[];
	/** Human-readable notes, e.g. one per unknown parameter. */
	warnings: string[];
}

/** Strip comments and join `+` continuation lines into logical lines. */
function logicalLines(text: string): string[] {
	const out: string[] = [];
	for (const raw of text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/)) {
		let line = raw;
		const semi = line.indexOf(';');
		if (semi >= 0) line = line.slice(0, semi);
		const dollar = line.search(/\s\$\s/);
		if (dollar >= 0) line = line.slice(0, dollar);
		const t = line.trim();
		if (t === '' || t.startsWith('*')) continue;
		if (t.startsWith('+')) {
			if (out.length === 0) throw new Error('a continuation line (+) comes before any .model line');
			out[out.length - 1] += ' ' + t.slice(1);
		} else out.push(t);
	}
	return out;
}

function parseOne(line: string, material?: JunctionMaterial): ParsedModelCard {
	const head = /^\.model\s+(\S+)\s+([a-z]+)\s*(.*)$/i.exec(line);
	if (!head) throw new Error(`expected a line such as '.model NAME D(IS=1e-14 N=1)', got '${line.slice(0, 60)}'`);
	const [, name, typeRaw, restRaw] = head;
	const type = typeRaw.toUpperCase();
	if (type !== 'D') throw new Error(`model '${name}' is of type '${type}'; only diode (D) models describe a junction here`);
	let rest = restRaw.trim();
	if (rest.startsWith('(')) {
		if (!rest.endsWith(')')) throw new Error(`model '${name}': opening parenthesis without a closing one`);
		rest = rest.slice(1, -1);
	}
	// Make "IS = 1e-14" and "IS=1e-14," uniform before splitting.
	const tokens = rest
		.replace(/\s*=\s*/g, '=')
		.split(/[\s,]+/)
		.filter((t) => t.length > 0);
	const input: Record<string, number> = {};
	const given: string[] = [];
	const unknown: { name: string; value: string }[] = [];
	const warnings: string[] = [];
	let level: string | undefined;
	for (const tok of tokens) {
		const eq = tok.indexOf('=');
		if (eq <= 0 || eq === tok.length - 1) throw new Error(`model '${name}': expected NAME=value, got '${tok}'`);
		const key = tok.slice(0, eq);
		const valueText = tok.slice(eq + 1);
		const canon = KNOWN[key.toLowerCase()];
		if (!canon) {
			unknown.push({ name: key.toUpperCase(), value: valueText });
			if (key.toLowerCase() === 'level') level = valueText;
			warnings.push(`parameter ${key.toUpperCase()}=${valueText} is not used by the junction engine; kept as written`);
			continue;
		}
		let v: number;
		try {
			v = parseSpiceNumber(valueText);
		} catch {
			throw new Error(`model '${name}': parameter ${canon} expected a number such as 1e-14 or 10p, got '${valueText}'`);
		}
		if (given.includes(canon)) warnings.push(`parameter ${canon} given twice; the last value is used`);
		else given.push(canon);
		input[canon] = v;
	}
	if (level !== undefined && level !== '1') warnings.push(`LEVEL=${level} models may interpret parameters differently`);
	if (input.IS === undefined) {
		// SPICE's default IS (1e-14 A) would invent a leakage figure; a catalogue must state it.
		throw new Error(`model '${name}' has no IS; a junction model must state its saturation current`);
	}
	const model = createModel(input as unknown as JunctionModelInput, material);
	return { name, type, model, given, unknown, warnings };
}

/**
 * Parse every `.model` card of type D in a text (cards of other types beside them are passed over).
 * @throws Error with the model name and the offending token when a card is malformed.
 */
export function parseModelCards(text: string, material?: JunctionMaterial): ParsedModelCard[] {
	const cards = logicalLines(text).filter((l) => /^\.model\b/i.test(l));
	if (cards.length === 0) throw new Error("expected at least one '.model NAME D(...)' card, found none");
	// A library's other cards (the shunt resistor's R model of a subcircuit) are passed over
	// when it holds diode cards; a text with none is refused by the diode check below.
	const diodes = cards.filter((l) => /^\.model\s+\S+\s+d\b/i.test(l));
	return (diodes.length ? diodes : cards).map((l) => parseOne(l, material));
}

/**
 * Parse a text holding exactly one `.model` card.
 * @throws Error when there is not exactly one card or it is malformed.
 */
export function parseModelCard(text: string, material?: JunctionMaterial): ParsedModelCard {
	const all = parseModelCards(text, material);
	if (all.length !== 1) throw new Error(`expected exactly one .model card, found ${all.length}`);
	return all[0];
}

/** Shortest text that reads back to the same double (JavaScript's own round-trip formatting). */
function num(v: number): string {
	return String(v).replace('e+', 'e');
}

export interface EmitOptions {
	/** Leave out the catalogue extensions (RSH, RSHF) that simulators do not know. */
	forSimulator?: boolean;
	/** Unknown parameters to write back (from a parsed card). */
	extra?: { name: string; value: string }[];
	/** Wrap lines longer than this with `+` continuations (default 78). */
	width?: number;
}

/**
 * Write a `.model NAME D(...)` card for a model. Numbers are written in the
 * shortest form that reads back bit-exactly, so parse(emit(m)) reproduces m.
 * @throws Error when the name is not a valid SPICE identifier.
 */
export function emitModelCard(name: string, model: JunctionModel, options: EmitOptions = {}): string {
	if (!/^[A-Za-z_][\w.+-]*$/.test(name)) throw new Error(`'${name}' is not a valid SPICE model name`);
	const p: string[] = [`IS=${num(model.IS)}`, `N=${num(model.N)}`, `RS=${num(model.RS)}`];
	if (model.RSH !== undefined && !options.forSimulator) p.push(`RSH=${num(model.RSH)}`);
	if (model.ISR !== undefined) p.push(`ISR=${num(model.ISR)}`, `NR=${num(model.NR)}`);
	if (model.BV !== undefined) p.push(`BV=${num(model.BV)}`, `IBV=${num(model.IBV)}`);
	if (model.NBV !== undefined) p.push(`NBV=${num(model.NBV)}`);
	p.push(`EG=${num(model.EG)}`, `XTI=${num(model.XTI)}`, `TNOM=${num(model.TNOM)}`);
	if (model.CJO !== undefined) p.push(`CJO=${num(model.CJO)}`);
	p.push(`VJ=${num(model.VJ)}`, `M=${num(model.M)}`, `FC=${num(model.FC)}`);
	if (!options.forSimulator && model.shuntFactorPer10K !== 2) p.push(`RSHF=${num(model.shuntFactorPer10K)}`);
	for (const e of options.extra ?? []) p.push(`${e.name}=${e.value}`);
	const width = options.width ?? 78;
	const lines: string[] = [];
	let cur = `.model ${name} D(`;
	for (let i = 0; i < p.length; i++) {
		const piece = p[i] + (i === p.length - 1 ? ')' : '');
		if (cur.length + 1 + piece.length > width && !cur.endsWith('(')) {
			lines.push(cur);
			cur = '+ ' + piece;
		} else cur += (cur.endsWith('(') ? '' : ' ') + piece;
	}
	lines.push(cur);
	return lines.join('\n');
}
