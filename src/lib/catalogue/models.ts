// Conversions between the catalogue's stored models (SPICE names, optional keys) and the
// engine's complete models, plus the flags every screen shows in words.
import { createModel, currentAtBias, FLAG_WORDS, scaleModel, type JunctionModel } from '$lib/junction';
import type { JunctionKind, Material } from './vocabulary';

/** A SPICE-named model as stored (TNOM in °C). Optional keys absent when unknown. */
export type StoredModel = {
	IS: number;
	N: number;
	RS?: number;
	RSH?: number;
	ISR?: number;
	NR?: number;
	BV?: number;
	IBV?: number;
	EG?: number;
	XTI?: number;
	TNOM?: number;
	CJO?: number;
	VJ?: number;
	M?: number;
	FC?: number;
};


export type FitInterval = {
	IS: [number, number];
	N: [number, number];
	RS: [number, number];
	RSH?: [number, number];
	EG?: [number, number];
};

export type FitQuality = { points: number; rejected: number; rmsResidualV: number };
export type FitRange = {
	currentA: [number, number];
	voltageV: [number, number];
	temperatureC: number;
	/** Smallest |current| anywhere in the run [A]. */
	minAbsCurrentA?: number;
	/** True when the run held reverse-bias points. */
	reverseMeasured?: boolean;
};

/**
 * The engine's material for a part. The engine uses the catalogue's material names and
 * owns their EG/XTI defaults (MATERIAL_DEFAULTS in src/lib/junction/model.ts, including
 * germanium and the assumed wide-gap EG); a Schottky part is metal–semiconductor whatever
 * its material column says.
 */
export function engineMaterial(material: Material, kind?: JunctionKind): Material {
	return kind === 'schottky' ? 'metal-semiconductor' : material;
}

/**
 * EG to hand the engine for single-temperature data: the part's given EG, or undefined
 * so that the engine applies its material default (and marks it when assumed).
 */
export function egFor(_material: Material, given?: StoredModel | null): number | undefined {
	return given?.EG ?? undefined;
}

const KEYS = ['IS', 'N', 'RS', 'RSH', 'ISR', 'NR', 'BV', 'IBV', 'EG', 'XTI', 'TNOM', 'CJO', 'VJ', 'M', 'FC'] as const;

/** A complete engine model from a stored one. @throws RangeError from the engine for invalid values. */
export function toEngine(stored: StoredModel, material: Material): JunctionModel {
	const input: Record<string, number> = {};
	for (const k of KEYS) if (stored[k] !== undefined && stored[k] !== null) input[k] = stored[k] as number;
	return createModel(input as unknown as JunctionModel, engineMaterial(material));
}

/** The stored form of an engine model: the parameters that carry information. */
export function toStored(m: JunctionModel): StoredModel {
	const out: StoredModel = { IS: m.IS, N: m.N, RS: m.RS, EG: m.EG, XTI: m.XTI, TNOM: m.TNOM };
	if (m.RSH !== undefined) out.RSH = m.RSH;
	if (m.ISR !== undefined) (out.ISR = m.ISR), (out.NR = m.NR);
	if (m.BV !== undefined) (out.BV = m.BV), (out.IBV = m.IBV);
	if (m.CJO !== undefined) (out.CJO = m.CJO), (out.VJ = m.VJ), (out.M = m.M), (out.FC = m.FC);
	return out;
}

/** The bias at which samples are compared for "worst" (highest leakage): −1 V at 25 °C. */
export const LEAKAGE_PROBE = { biasV: -1, temperatureC: 25 };

/** |I| at a bias and temperature, or NaN when the model cannot be evaluated. */
export function currentMagnitude(stored: StoredModel, material: Material, biasV: number, temperatureC: number): number {
	try {
		return Math.abs(currentAtBias(scaleModel(toEngine(stored, material), temperatureC), biasV));
	} catch {
		return NaN;
	}
}

export type PartFacts = {
	kind: JunctionKind;
	material: Material;
	admitsLight: boolean;
	isMeasured: boolean;
	hasModel: boolean;
	sampleCount: number;
	reverseMeasured: boolean;
	/** Where the part's capacitance comes from (null: it has none). */
	capacitanceSource?: 'measured' | 'given' | null;
};

/** Cautions about a part in plain words; screens list them beside the model. */
export function partFlags(p: PartFacts): { code: string; text: string }[] {
	const flags: { code: string; text: string }[] = [];
	if (!p.hasModel) flags.push({ code: 'no-model', text: 'No model yet: neither a measured sweep nor a given card.' });
	else if (!p.isMeasured)
		flags.push({
			code: 'unmeasured',
			text: 'The model comes from a card or datasheet, not from our bench: nothing here has been measured.'
		});
	if (p.hasModel && !p.reverseMeasured)
		flags.push({ code: 'reverse-not-measured', text: FLAG_WORDS['reverse-not-measured'].long });
	if (p.capacitanceSource === 'given')
		flags.push({ code: 'capacitance-from-card', text: FLAG_WORDS['capacitance-from-card'].long });
	if (p.isMeasured && p.sampleCount < 3)
		flags.push({
			code: 'few-samples',
			text: `Only ${p.sampleCount} sample${p.sampleCount === 1 ? '' : 's'} measured; fewer than three says little about part-to-part spread.`
		});
	if (p.material === 'metal-semiconductor' || p.kind === 'schottky')
		flags.push({ code: 'metal-semiconductor', text: FLAG_WORDS['metal-semiconductor'].long });
	if (p.admitsLight || p.kind === 'led')
		flags.push({ code: 'light-sensitive', text: FLAG_WORDS['light-sensitive'].long });
	return flags;
}
