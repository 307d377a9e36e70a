/**
 * Depletion (junction) capacitance of the SPICE diode model.
 *
 *   C(Vd) = CJO·(1 − Vd/VJ)^(−M)                          for Vd < FC·VJ
 *   C(Vd) = CJO/(1 − FC)^(1+M) · (1 − FC·(1+M) + M·Vd/VJ)  for Vd ≥ FC·VJ (linear extension)
 *
 * Source: SPICE2 (Nagel, UCB/ERL M520, 1975) depletion-capacitance model, as in ngspice 39 dioload.c.
 * Diffusion (transit-time) capacitance is not modelled: the catalogue has no TT data.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { scaleModel, type ScaledJunction } from './temperature';
import { solveBias } from './shockley';

/** The four depletion-capacitance parameters of a junction at one temperature. */
export interface DepletionParameters {
	/** Zero-bias capacitance [F]. */
	CJO: number;
	/** Junction potential [V]. */
	VJ: number;
	/** Grading coefficient [-]. */
	M: number;
	/** Forward-bias coefficient [-]: the formula is linearised from FC·VJ on. */
	FC: number;
}

/**
 * Depletion capacitance [F] at junction voltage Vd [V] from CJO, VJ, M and FC (formula in
 * the file header), at the temperature those parameters hold for.
 * @throws RangeError when Vd is not finite.
 */
export function depletionCapacitanceAt(p: DepletionParameters, vd: number): number {
	if (!Number.isFinite(vd)) throw new RangeError(`junction voltage must be finite, got ${vd}`);
	if (p.CJO === 0) return 0;
	if (vd < p.FC * p.VJ) return p.CJO * Math.exp(-p.M * Math.log(1 - vd / p.VJ));
	const f2 = Math.exp((1 + p.M) * Math.log(1 - p.FC));
	const f3 = 1 - p.FC * (1 + p.M);
	return (p.CJO / f2) * (f3 + (p.M * vd) / p.VJ);
}

/**
 * Depletion capacitance [F] at junction voltage Vd [V] for a scaled model (formula in file header).
 * @throws RangeError when Vd is not finite.
 */
export function depletionCapacitance(s: ScaledJunction, vd: number): number {
	return depletionCapacitanceAt(s, vd);
}

/**
 * Junction capacitance [F] at terminal bias V [V] and temperature [°C]. The junction
 * voltage is found from the DC solution (V minus the drop on RS); CJO and VJ are
 * temperature-scaled as in SPICE.
 * @throws RangeError when the model has no CJO, or inputs are invalid.
 */
export function junctionCapacitance(
	model: JunctionModel,
	biasV: number,
	temperatureC: number,
	constants: PhysicalConstants = SI_2019
): number {
	if (model.CJO === undefined) throw new RangeError('the model has no CJO, so its capacitance is unknown');
	if (!Number.isFinite(biasV)) throw new RangeError(`bias must be finite, got ${biasV}`);
	const s = scaleModel(model, temperatureC, constants);
	const { vd } = solveBias(s, biasV);
	return depletionCapacitance(s, vd);
}
