/**
 * Temperature scaling of a junction model to an operating temperature.
 *
 * Saturation currents follow the SPICE diode model exactly as ngspice 39
 * implements it (diotemp.c), with a constant activation energy EG:
 *   IS(T)  = IS ·(T/Tnom)^(XTI/N) ·exp((T/Tnom − 1)·EG/(N·Vt(T)))
 *   ISR(T) = ISR·(T/Tnom)^(XTI/NR)·exp((T/Tnom − 1)·EG/(NR·Vt(T)))
 * (ngspice itself scales ISR with N rather than NR; the engine uses NR, which is
 * what the recombination term's own emission coefficient implies.)
 * Shunt resistance: RSH(T) = RSH / f^((T − Tnom)/10 K), f = 2 by default (common practice).
 * Junction potential and capacitance follow the SPICE2/3 formulas with the silicon
 * band-gap Eg(T) = 1.16 − 7.02e-4·T²/(T + 1108) eV (Varshni form used by SPICE;
 * Varshni, Physica 34 (1967) 149; coefficients as in SPICE3 diotemp.c).
 */
import { celsiusToKelvin, thermalVoltage, SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';

/** A model evaluated at one temperature: everything the bias-point equations need. */
export interface ScaledJunction {
	temperatureK: number;
	/** Thermal voltage k·T/q [V]. */
	vt: number;
	IS: number;
	/** N·Vt [V]. */
	nvt: number;
	RS: number;
	/** Shunt conductance 1/RSH(T) [S], 0 when there is no shunt. */
	GSH: number;
	ISR: number;
	/** NR·Vt [V]. */
	nrvt: number;
	/** Effective breakdown voltage (positive) after matching IBV, or 0 when BV is absent. */
	BVeff: number;
	hasBV: boolean;
	/** NBV·Vt [V]. */
	nbvt: number;
	CJO: number;
	VJ: number;
	M: number;
	FC: number;
}

/** SPICE reference temperature for the band-gap formula, 27 °C in kelvin. */
const REFTEMP = 300.15;

/**
 * Saturation-current temperature factor: (T/Tnom)^(XTI/n)·exp((T/Tnom − 1)·EG/(n·k·T/q)).
 * Returns the natural log of the factor so callers can combine it without overflow.
 * @throws RangeError when the temperatures are not positive.
 */
export function logSaturationFactor(
	temperatureK: number,
	tnomK: number,
	EG: number,
	XTI: number,
	n: number,
	constants: PhysicalConstants = SI_2019
): number {
	if (!(tnomK > 0) || !(n > 0)) throw new RangeError('Tnom and emission coefficient must be positive');
	const vt = thermalVoltage(temperatureK, constants);
	const ratio = temperatureK / tnomK;
	return (XTI / n) * Math.log(ratio) + ((ratio - 1) * EG) / (n * vt);
}

/**
 * Saturation current at temperature: IS(T) = IS·(T/Tnom)^(XTI/N)·exp((T/Tnom − 1)·EG/(N·Vt(T))) [A].
 * Temperatures in °C. Source: SPICE2/3 diode model; matches ngspice 39 diotemp.c.
 * @throws RangeError for non-positive IS or N, or temperatures at/below absolute zero.
 */
export function saturationCurrentAt(model: JunctionModel, temperatureC: number, constants: PhysicalConstants = SI_2019): number {
	if (!(model.IS > 0)) throw new RangeError(`IS must be positive, got ${model.IS}`);
	const T = celsiusToKelvin(temperatureC);
	const Tn = celsiusToKelvin(model.TNOM);
	return model.IS * Math.exp(logSaturationFactor(T, Tn, model.EG, model.XTI, model.N, constants));
}

/**
 * Shunt resistance at temperature: RSH(T) = RSH / f^((T − Tnom)/10) [Ω], f = shuntFactorPer10K.
 * Returns undefined when the model has no shunt. The halving per 10 K is common practice, not physics.
 * @throws RangeError for invalid temperatures.
 */
export function shuntResistanceAt(model: JunctionModel, temperatureC: number): number | undefined {
	celsiusToKelvin(temperatureC);
	if (model.RSH === undefined) return undefined;
	return model.RSH / Math.pow(model.shuntFactorPer10K, (temperatureC - model.TNOM) / 10);
}

/**
 * SPICE junction-potential and zero-bias-capacitance temperature scaling (ngspice diotemp.c, TLEVC = 0).
 * VJ(T) = 2·Vt·... built from the band-gap Eg(T) above; CJO(T) = CJO·(1 + M·(4e-4·(T − Tref) − γ(T)))/(…Tnom…).
 * Returns { VJ [V], CJO [F] }. At T = Tnom both are returned unchanged.
 * @throws RangeError for invalid temperatures.
 */
export function junctionPotentialAt(
	model: Pick<JunctionModel, 'VJ' | 'M' | 'CJO' | 'TNOM'>,
	temperatureC: number,
	constants: PhysicalConstants = SI_2019
): { VJ: number; CJO: number } {
	const T = celsiusToKelvin(temperatureC);
	const Tn = celsiusToKelvin(model.TNOM);
	const k = constants.k;
	const q = constants.q;
	const vt = (k * T) / q;
	const vtnom = (k * Tn) / q;
	const fact2 = T / REFTEMP;
	const egfet = 1.16 - (7.02e-4 * T * T) / (T + 1108);
	const arg = -egfet / (2 * k * T) + 1.1150877 / (k * (REFTEMP + REFTEMP));
	const pbfact = -2 * vt * (1.5 * Math.log(fact2) + q * arg);
	const egfet1 = 1.16 - (7.02e-4 * Tn * Tn) / (Tn + 1108);
	const arg1 = -egfet1 / (k * 2 * Tn) + 1.1150877 / (2 * k * REFTEMP);
	const fact1 = Tn / REFTEMP;
	const pbfact1 = -2 * vtnom * (1.5 * Math.log(fact1) + q * arg1);
	const pbo = (model.VJ - pbfact1) / fact1;
	const gmaold = (model.VJ - pbo) / pbo;
	const cjo0 = model.CJO ?? 0;
	let cjo = cjo0 / (1 + model.M * (400e-6 * (Tn - REFTEMP) - gmaold));
	const VJ = pbfact + fact2 * pbo;
	const gmanew = (VJ - pbo) / pbo;
	cjo *= 1 + model.M * (400e-6 * (T - REFTEMP) - gmanew);
	if (!(VJ > 0)) throw new RangeError(`junction potential becomes non-positive at ${temperatureC} °C`);
	return { VJ, CJO: cjo };
}

/**
 * Scale a model to an operating temperature (°C), producing the quantities the
 * bias-point equations use. Breakdown: the knee voltage is adjusted so the
 * current at −BV equals IBV, with the same fixed-point iteration as ngspice 39
 * (diotemp.c), converged to 1e-12 relative instead of the simulator's RELTOL.
 * @throws RangeError for invalid temperatures or parameters.
 */
export function scaleModel(model: JunctionModel, temperatureC: number, constants: PhysicalConstants = SI_2019): ScaledJunction {
	const T = celsiusToKelvin(temperatureC);
	const Tn = celsiusToKelvin(model.TNOM);
	const vt = thermalVoltage(T, constants);
	const IS = model.IS * Math.exp(logSaturationFactor(T, Tn, model.EG, model.XTI, model.N, constants));
	const ISR =
		model.ISR !== undefined && model.ISR > 0
			? model.ISR * Math.exp(logSaturationFactor(T, Tn, model.EG, model.XTI, model.NR, constants))
			: 0;
	const rsh = shuntResistanceAt(model, temperatureC);
	const GSH = rsh === undefined ? 0 : 1 / rsh;
	let VJ = model.VJ;
	let CJO = model.CJO ?? 0;
	if (temperatureC !== model.TNOM) {
		const s = junctionPotentialAt(model, temperatureC, constants);
		VJ = s.VJ;
		CJO = s.CJO;
	}
	// ngspice limits the junction potential so the linearisation point FC·VJ stays below 1 V.
	if (model.FC * VJ > 1) VJ = 1 / model.FC;
	const nbv = model.NBV ?? model.N;
	const nbvt = nbv * vt;
	let BVeff = 0;
	const hasBV = model.BV !== undefined;
	if (hasBV) {
		const bv = model.BV as number;
		const cbv = model.IBV;
		if (cbv < (IS * bv) / vt) {
			BVeff = bv;
		} else {
			let xbv = bv - nbvt * Math.log(1 + cbv / IS);
			for (let i = 0; i < 200; i++) {
				const next = bv - nbvt * Math.log(cbv / IS + 1 - xbv / vt);
				const done = Math.abs(next - xbv) <= 1e-13 * Math.abs(bv);
				xbv = next;
				if (done) break;
			}
			BVeff = xbv;
		}
	}
	return {
		temperatureK: T,
		vt,
		IS,
		nvt: model.N * vt,
		RS: model.RS,
		GSH,
		ISR,
		nrvt: model.NR * vt,
		BVeff,
		hasBV,
		nbvt,
		CJO,
		VJ,
		M: model.M,
		FC: model.FC
	};
}
