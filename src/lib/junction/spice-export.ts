/**
 * SPICE blocks that reproduce the engine's predictions in ngspice (39 and later).
 *
 * One block per part: ASCII only, numbers to 7 significant digits.
 *  - A plain `.model NAME D(...)` when the junction is the SPICE diode alone (no shunt,
 *    no recombination term): IS N RS BV IBV NBV EG XTI TNOM CJO VJ M FC as known.
 *  - Otherwise a `.subckt NAME anode cathode`: RS as a resistor from the anode to the
 *    junction node, the diode (its `.model` with RS = 0), and across the junction only
 *    (as the engine puts them, after RS):
 *     - the shunt RSH as a resistor whose exponential coefficient makes its conductance
 *       rise by the part's factor f per 10 K: ngspice's R(T) = R(TNOM)·1.01^(tce·(T − TNOM))
 *       gives tce = −ln f/(10·ln 1.01) (ngspice manual, resistor temperature coefficients),
 *       with the resistor's own TNOM set to the model's;
 *     - the recombination current ISR/NR as a behavioural source in the engine's form
 *       ISR(T)·(exp(Vd/(NR·Vt)) − 1)·((1 − Vd/VJ(T))² + 0.005)^(M/2), ISR(T) scaled with NR and
 *       kept in reverse bias (ngspice's own diode scales ISR with N and drops it below
 *       −3·N·Vt, so its ISR parameter would not reproduce the engine), VJ(T) by the SPICE
 *       formula (temperature.ts), written as Eg(T) − 1.1150877·T/Tref − 3·Vt·ln(T/Tref) + (T/Tref)·pbo.
 * Nothing the engine uses is left out: a part without RSH or ISR needs neither. The
 * simulator's GMIN is the netlist's business: a test deck sets it to zero, a library does not.
 */
import type { JunctionModel } from './model';
import { currentAtBias } from './shockley';
import { scaleModel } from './temperature';

/** Boltzmann constant over the elementary charge, SI 2019 exact values [V/K], as the engine uses. */
const K_OVER_Q = '8.617333262e-5';
/** SPICE reference temperature of the band-gap formula [K]. */
const REFTEMP = 300.15;

/** A number to 7 significant digits in SPICE's notation (1.234568e-14, 27, 0.5). */
export function spiceNumber(v: number): string {
	if (!Number.isFinite(v)) throw new RangeError(`cannot write ${v} into a SPICE card`);
	const r = Number(v.toPrecision(7));
	const plain = String(r);
	const exp = r.toExponential().replace('e+', 'e');
	return (plain.length <= exp.length ? plain : exp).replace('e+', 'e');
}

/** tce of an ngspice resistor whose conductance rises by `factor` every 10 K. */
export function shuntTce(factor: number): number {
	if (!(factor > 0)) throw new RangeError(`shunt factor per 10 K must be positive, got ${factor}`);
	return -Math.log(factor) / (10 * Math.log(1.01));
}

/** Text made safe for a SPICE comment: common symbols spelt in ASCII, anything else a '?'. */
export function asciiText(text: string): string {
	const words: Record<string, string> = {
		'–': '-', '—': '-', '−': '-', '‘': "'", '’': "'", '“': '"', '”': '"', '…': '...',
		'°': 'deg', 'µ': 'u', 'μ': 'u', 'Ω': 'Ohm', '×': 'x', '·': '*', '≤': '<=', '≥': '>=', ' ': ' '
	};
	return text
		.replace(/[\r\n\t]+/g, ' ')
		.replace(/[^\x20-\x7e]/g, (c) => words[c] ?? '?');
}

/**
 * A SPICE identifier from a part number ("QVL-D9" → "QVL-D9", "1N/x" → "D1N_x"),
 * made unique against `taken` (lower-cased names already used) with a _2, _3 … suffix.
 */
export function spiceIdentifier(text: string, taken?: Set<string>): string {
	let name = asciiText(text).replace(/[^\w.+-]/g, '_');
	if (!/^[A-Za-z_]/.test(name)) name = `D${name}`;
	let candidate = name;
	for (let i = 2; taken?.has(candidate.toLowerCase()); i++) candidate = `${name}_${i}`;
	taken?.add(candidate.toLowerCase());
	return candidate;
}

/** Whether a model needs the subcircuit (a shunt or a recombination term), not a plain `.model`. */
export function needsSubcircuit(model: JunctionModel): boolean {
	return model.RSH !== undefined || (model.ISR !== undefined && model.ISR > 0);
}

/** The diode card's parameters (RS as given; ISR/NR never: see the file header). */
function diodeParameters(model: JunctionModel, rs: number): string[] {
	const p = [`IS=${spiceNumber(model.IS)}`, `N=${spiceNumber(model.N)}`, `RS=${spiceNumber(rs)}`];
	if (model.BV !== undefined) p.push(`BV=${spiceNumber(model.BV)}`, `IBV=${spiceNumber(model.IBV)}`);
	if (model.NBV !== undefined) p.push(`NBV=${spiceNumber(model.NBV)}`);
	p.push(`EG=${spiceNumber(model.EG)}`, `XTI=${spiceNumber(model.XTI)}`, `TNOM=${spiceNumber(model.TNOM)}`);
	if (model.CJO !== undefined) p.push(`CJO=${spiceNumber(model.CJO)}`);
	p.push(`VJ=${spiceNumber(model.VJ)}`, `M=${spiceNumber(model.M)}`, `FC=${spiceNumber(model.FC)}`);
	return p;
}

/** `head(` + parameters + `)`, wrapped with `+` continuation lines under 78 characters. */
function wrap(head: string, parts: string[], close = ')'): string[] {
	const lines: string[] = [];
	let cur = head;
	parts.forEach((piece, i) => {
		const text = piece + (i === parts.length - 1 ? close : '');
		if (cur.length + 1 + text.length > 78 && !/[(=]$/.test(cur)) {
			lines.push(cur);
			cur = '+ ' + text;
		} else cur += (/[(]$/.test(cur) ? '' : ' ') + text;
	});
	lines.push(cur);
	return lines;
}

/**
 * The behavioural recombination source between `node` and `cathode` (file header), its
 * expression broken between terms over `+` continuation lines.
 */
function recombinationSource(model: JunctionModel, node: string): string[] {
	const tn = model.TNOM + 273.15;
	// pbo as temperature.ts (junctionPotentialAt) derives it from VJ at TNOM.
	const egNom = 1.16 - (7.02e-4 * tn * tn) / (tn + 1108);
	const pbfactNom = -3 * 8.617333262e-5 * tn * Math.log(tn / REFTEMP) + egNom - (1.1150877 * tn) / REFTEMP;
	const pbo = (model.VJ - pbfactNom) / (tn / REFTEMP);
	const T = '(temper+273.15)';
	const vt = `(${K_OVER_Q}*${T})`;
	const vd = `v(${node},cathode)`;
	const n = spiceNumber;
	const terms = [
		`I=${n(model.ISR as number)}`,
		`*exp(${n(model.XTI / model.NR)}*ln(${T}/${n(tn)})`,
		`+(${T}/${n(tn)}-1)*${n(model.EG / model.NR)}/${vt})`,
		`*(exp(${vd}/(${n(model.NR)}*${vt}))-1)`,
		`*pow((1-${vd}/min(1.16`,
		`-7.02e-4*${T}*${T}/(${T}+1108)`,
		`-1.1150877*${T}/${REFTEMP}`,
		`-3*${vt}*ln(${T}/${REFTEMP})`,
		`+${T}/${REFTEMP}*${n(pbo)}, ${n(1 / model.FC)}))^2`,
		`+0.005, ${n(model.M / 2)})`
	];
	const lines: string[] = [];
	let cur = `Brec ${node} cathode`;
	for (const t of terms) {
		if (cur.length + 1 + t.length > 78) {
			lines.push(cur);
			cur = '+ ' + t;
		} else cur += ' ' + t;
	}
	lines.push(cur);
	return lines;
}

export interface SpiceBlockInput {
	/** The block's name: a SPICE identifier (spiceIdentifier). */
	name: string;
	model: JunctionModel;
	/** Comment lines (without the leading '*'); made ASCII. */
	comments?: string[];
}

/**
 * The SPICE block of one part (file header): a `.subckt NAME anode cathode` when the model
 * has a shunt or a recombination term, a plain `.model NAME D(...)` otherwise.
 * @throws Error when the name is not a SPICE identifier.
 */
export function emitSpiceBlock(input: SpiceBlockInput): string {
	const { name, model } = input;
	if (!/^[A-Za-z_][\w.+-]*$/.test(name)) throw new Error(`'${name}' is not a valid SPICE name`);
	const out = (input.comments ?? []).map((c) => `* ${asciiText(c)}`.trimEnd());
	if (!needsSubcircuit(model)) {
		out.push(...wrap(`.model ${name} D(`, diodeParameters(model, model.RS)));
		return out.join('\n') + '\n';
	}
	const junction = model.RS > 0 ? 'j' : 'anode';
	out.push(`.subckt ${name} anode cathode`);
	if (model.RS > 0) out.push(`Rser anode j ${spiceNumber(model.RS)}`);
	out.push(`D1 ${junction} cathode ${name}_d`);
	out.push(...wrap(`.model ${name}_d D(`, diodeParameters(model, 0)));
	if (model.RSH !== undefined) {
		out.push(`Rsh ${junction} cathode ${name}_rsh r=${spiceNumber(model.RSH)}`);
		out.push(`.model ${name}_rsh R(tce=${spiceNumber(shuntTce(model.shuntFactorPer10K))} tnom=${spiceNumber(model.TNOM)})`);
	}
	if (model.ISR !== undefined && model.ISR > 0) out.push(...recombinationSource(model, junction));
	out.push(`.ends ${name}`);
	return out.join('\n') + '\n';
}

/** One measured sample's model, labelled by its unit. */
export interface LabelledModel {
	unit: string;
	model: JunctionModel;
}

/**
 * The sample that leaks most at a bias [V] and temperature [°C] (|I| largest), first on ties;
 * null when there is none.
 */
export function worstSampleAt(samples: readonly LabelledModel[], biasV: number, temperatureC: number): LabelledModel | null {
	let best: LabelledModel | null = null;
	let most = -Infinity;
	for (const s of samples) {
		const leak = Math.abs(currentAtBias(scaleModel(s.model, temperatureC), biasV));
		if (leak > most) (best = s), (most = leak);
	}
	return best;
}
