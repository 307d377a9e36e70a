/**
 * The junction model: SPICE diode parameter names, material defaults and validation.
 *
 * Parameter meanings (SI units, temperatures in °C as in SPICE):
 *  IS  saturation current [A]            N   emission (ideality) coefficient [-]
 *  RS  series resistance [Ω]             RSH shunt resistance [Ω] (absent = no shunt)
 *  ISR recombination saturation current [A]   NR  its emission coefficient [-]
 *  BV  reverse breakdown voltage, positive [V]  IBV current at breakdown [A]   NBV breakdown emission coefficient
 *  EG  activation energy [eV]            XTI saturation-current temperature exponent [-]
 *  TNOM parameter measurement temperature [°C]
 *  CJO zero-bias junction capacitance [F]  VJ junction potential [V]  M grading coefficient  FC forward-bias capacitance coefficient
 *  shuntFactorPer10K: RSH falls by this factor for every 10 K of heating (default 2, common practice).
 */

export type JunctionMaterial = 'silicon' | 'schottky' | 'wide-gap';

export interface JunctionModel {
	IS: number;
	N: number;
	RS: number;
	RSH?: number;
	ISR?: number;
	NR: number;
	BV?: number;
	IBV: number;
	NBV?: number;
	EG: number;
	XTI: number;
	TNOM: number;
	CJO?: number;
	VJ: number;
	M: number;
	FC: number;
	shuntFactorPer10K: number;
	material: JunctionMaterial;
}

/** Input accepted by `createModel`: IS is required, the rest falls back to defaults. */
export type JunctionModelInput = Partial<JunctionModel> & { IS: number };

/**
 * EG/XTI defaults by material. Silicon PN 1.11 eV / 3 and metal–semiconductor
 * 0.69 eV / 2 are the values SPICE documentation customarily quotes (Berkeley
 * SPICE2/3 user guides, diode model section; from memory). Wide-gap parts
 * (LEDs, SiC) vary too much to guess, so EG must be supplied.
 */
export const MATERIAL_DEFAULTS: Record<JunctionMaterial, { EG?: number; XTI: number }> = {
	silicon: { EG: 1.11, XTI: 3 },
	schottky: { EG: 0.69, XTI: 2 },
	'wide-gap': { XTI: 3 }
};

/** SPICE defaults for the remaining parameters (ngspice manual, diode model table). */
export const SPICE_DEFAULTS = {
	N: 1,
	RS: 0,
	NR: 2,
	IBV: 1e-3,
	TNOM: 27,
	VJ: 1,
	M: 0.5,
	FC: 0.5,
	shuntFactorPer10K: 2
} as const;

function positive(name: string, v: number | undefined, allowZero = false): void {
	if (v === undefined) return;
	if (!Number.isFinite(v) || v < 0 || (!allowZero && v === 0))
		throw new RangeError(`${name} must be a finite ${allowZero ? 'non-negative' : 'positive'} number, got ${v}`);
}

/**
 * Build a complete, validated model from partial parameters and a material.
 * @throws RangeError for missing/invalid values (e.g. IS ≤ 0, N ≤ 0, FC ≥ 1, wide-gap without EG).
 */
export function createModel(input: JunctionModelInput, material?: JunctionMaterial): JunctionModel {
	const mat: JunctionMaterial = material ?? input.material ?? 'silicon';
	const md = MATERIAL_DEFAULTS[mat];
	if (!md) throw new RangeError(`unknown junction material '${String(mat)}'`);
	const EG = input.EG ?? md.EG;
	if (EG === undefined) throw new RangeError(`EG must be given for a ${mat} junction (no sensible default)`);
	const model: JunctionModel = {
		IS: input.IS,
		N: input.N ?? SPICE_DEFAULTS.N,
		RS: input.RS ?? SPICE_DEFAULTS.RS,
		NR: input.NR ?? SPICE_DEFAULTS.NR,
		IBV: input.IBV ?? SPICE_DEFAULTS.IBV,
		EG,
		XTI: input.XTI ?? md.XTI,
		TNOM: input.TNOM ?? SPICE_DEFAULTS.TNOM,
		VJ: input.VJ ?? SPICE_DEFAULTS.VJ,
		M: input.M ?? SPICE_DEFAULTS.M,
		FC: input.FC ?? SPICE_DEFAULTS.FC,
		shuntFactorPer10K: input.shuntFactorPer10K ?? SPICE_DEFAULTS.shuntFactorPer10K,
		material: mat
	};
	if (input.RSH !== undefined) model.RSH = input.RSH;
	if (input.ISR !== undefined) model.ISR = input.ISR;
	if (input.BV !== undefined) model.BV = input.BV;
	if (input.NBV !== undefined) model.NBV = input.NBV;
	if (input.CJO !== undefined) model.CJO = input.CJO;
	validateModel(model);
	return model;
}

/**
 * Check every parameter of a model is inside its physical domain.
 * @throws RangeError naming the first offending parameter.
 */
export function validateModel(m: JunctionModel): void {
	positive('IS', m.IS);
	positive('N', m.N);
	positive('RS', m.RS, true);
	positive('RSH', m.RSH);
	positive('ISR', m.ISR, true);
	positive('NR', m.NR);
	positive('BV', m.BV);
	positive('IBV', m.IBV);
	positive('NBV', m.NBV);
	positive('EG', m.EG);
	positive('CJO', m.CJO, true);
	positive('VJ', m.VJ);
	positive('M', m.M, true);
	positive('shuntFactorPer10K', m.shuntFactorPer10K);
	if (!Number.isFinite(m.XTI)) throw new RangeError(`XTI must be finite, got ${m.XTI}`);
	if (!Number.isFinite(m.TNOM) || m.TNOM <= -273.15) throw new RangeError(`TNOM must be a temperature above absolute zero in °C, got ${m.TNOM}`);
	if (!(m.FC >= 0 && m.FC < 1)) throw new RangeError(`FC must be in [0, 1), got ${m.FC}`);
	if (m.M >= 1) throw new RangeError(`M must be below 1, got ${m.M}`);
}
