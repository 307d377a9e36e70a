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

import type { Material } from './names';

/**
 * Material names accepted on input: the catalogue's four (see `MATERIALS`), plus
 * 'schottky', the engine's earlier name for a metal–semiconductor junction, still read
 * (as 'metal-semiconductor') so records written with it keep loading.
 */
export type JunctionMaterial = Material | 'schottky';

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
	material: Material;
	/** True when EG is the material's assumed default rather than given or fitted (see MATERIAL_DEFAULTS). */
	egAssumed?: true;
}

/** Input accepted by `createModel`: IS is required, the rest falls back to defaults. */
export type JunctionModelInput = Partial<Omit<JunctionModel, 'material'>> & { IS: number; material?: JunctionMaterial };

/** Defaults of one material: activation energy EG [eV] and saturation-current exponent XTI [-]. */
export interface MaterialDefault {
	EG: number;
	XTI: number;
	/**
	 * The EG is a guess that does not hold for the whole class (wide-gap parts): models
	 * that fall back on it are marked `egAssumed`, and single-temperature fits warn.
	 */
	assumed?: true;
}

/**
 * EG/XTI defaults by material, the one place the catalogue's defaults live.
 *  - silicon 1.11 eV / 3 and metal–semiconductor 0.69 eV / 2: the values SPICE
 *    documentation customarily quotes (Berkeley SPICE2/3 user guides, diode model
 *    section; from memory).
 *  - germanium 0.67 eV / 3: the 300 K band gap as tabulated in B. G. Streetman and
 *    S. K. Banerjee, Solid State Electronic Devices, appendix of semiconductor
 *    properties (from memory; Sze & Ng, Physics of Semiconductor Devices, 3rd ed.,
 *    Appendix G, give 0.66 eV). XTI 3 is SPICE's PN-junction value, applied to germanium
 *    PN junctions as common practice.
 *  - wide-gap 1.9 eV / 3, ASSUMED: about the band gap of a red/amber LED (textbook
 *    value, from memory); blue/green LEDs and SiC lie far higher (≈2.5–3.3 eV), so
 *    this default is marked as assumed wherever it is used.
 */
export const MATERIAL_DEFAULTS: Readonly<Record<Material, MaterialDefault>> = {
	silicon: { EG: 1.11, XTI: 3 },
	'metal-semiconductor': { EG: 0.69, XTI: 2 },
	germanium: { EG: 0.67, XTI: 3 },
	'wide-gap': { EG: 1.9, XTI: 3, assumed: true }
};

/**
 * The catalogue material for an accepted material name ('schottky' → 'metal-semiconductor').
 * @throws RangeError for an unknown name.
 */
export function canonicalMaterial(material: JunctionMaterial): Material {
	const m = material === 'schottky' ? 'metal-semiconductor' : material;
	if (!Object.prototype.hasOwnProperty.call(MATERIAL_DEFAULTS, m)) throw new RangeError(`unknown junction material '${String(material)}'`);
	return m;
}

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

function required(name: string, v: number | undefined): void {
	if (v === undefined || v === null) throw new RangeError(`${name} is required`);
	positive(name, v);
}

/**
 * Build a complete, validated model from partial parameters and a material (default
 * silicon). EG and XTI fall back on MATERIAL_DEFAULTS; a model whose EG is an assumed
 * default (wide-gap) is marked `egAssumed`.
 * @throws RangeError for missing/invalid values (e.g. IS ≤ 0, N ≤ 0, FC ≥ 1) or an unknown material.
 */
export function createModel(input: JunctionModelInput, material?: JunctionMaterial): JunctionModel {
	const mat = canonicalMaterial(material ?? input.material ?? 'silicon');
	const md = MATERIAL_DEFAULTS[mat];
	const EG = input.EG ?? md.EG;
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
	// A model rebuilt from one whose EG was assumed stays marked.
	if (input.EG === undefined ? md.assumed : input.egAssumed) model.egAssumed = true;
	validateModel(model);
	return model;
}

/**
 * Check every parameter of a model is inside its physical domain.
 * @throws RangeError naming the first offending parameter.
 */
export function validateModel(m: JunctionModel): void {
	// IS and N are what every prediction is made of: absent is not optional here.
	required('IS', m.IS);
	required('N', m.N);
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
