/**
 * Low-frequency current noise of a junction at a bias point.
 *
 * Shot noise of the ideal p–n junction: its current I_d = IS·(exp(V_j/(N·Vt)) − 1) is the
 * difference of two independent carrier flows, IS·exp(V_j/(N·Vt)) forward and IS back,
 * each with full shot noise, so the one-sided power spectral density is
 *   S_shot = 2q·(I_d + 2·IS)                                            [A²/Hz]
 * (A. van der Ziel, Noise in Solid State Devices and Circuits, Wiley 1986, the p–n
 * junction chapter; from memory). V_j is the voltage across the junction itself, after the
 * drop on RS. The shunt adds its thermal (Johnson–Nyquist) noise
 *   S_shunt = 4·k·T/RSH(T)                                              [A²/Hz]
 * (H. Nyquist, Phys. Rev. 32 (1928) 110). The two add in power.
 *
 * At zero bias S_shot = 4q·IS, which equals the Nyquist value 4kT·G0 of the junction's
 * conductance G0 = IS/(N·Vt) only for N = 1 (the junction is then in thermal equilibrium
 * and the two flows are the whole story). For N > 1 the formula gives N times the Nyquist
 * value at zero bias: it is an approximation there, and screens say so beside the number.
 * Recombination (ISR) and breakdown currents are not included: the catalogue's clamps sit
 * where the ideal term and the shunt dominate. Flicker (1/f) noise is not modelled.
 * RS's own thermal noise is in series with the junction's very large dynamic resistance
 * and reaches the node attenuated by RS/(RS + r_d), so it is left out.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { ScaledJunction } from './temperature';

/** Below this |N − 1| the zero-bias shot-noise form is the exact Nyquist value. */
const IDEAL_N_TOLERANCE = 1e-9;

/**
 * Current-noise power spectral density [A²/Hz] of a scaled junction whose junction voltage
 * (after RS) is `vd` [V]: 2q·(IS·expm1(vd/(N·Vt)) + 2·IS) + 4kT·GSH (formulas in the file header).
 * @throws RangeError when vd is not finite.
 */
export function noisePower(s: ScaledJunction, vd: number, constants: PhysicalConstants = SI_2019): number {
	if (!Number.isFinite(vd)) throw new RangeError(`junction voltage must be finite, got ${vd}`);
	const id = s.IS * Math.expm1(vd / s.nvt);
	// I_d ≥ −IS always, so the shot term is never negative; max() only absorbs rounding.
	const shot = 2 * constants.q * Math.max(0, id + 2 * s.IS);
	const thermal = 4 * constants.k * s.temperatureK * s.GSH;
	return shot + thermal;
}

/** Current-noise density [A/√Hz]: the square root of `noisePower`. */
export function noiseDensity(s: ScaledJunction, vd: number, constants: PhysicalConstants = SI_2019): number {
	return Math.sqrt(noisePower(s, vd, constants));
}

/**
 * Whether the shot-noise form is only an approximation for this model near zero bias
 * (N ≠ 1; see the file header). Screens print this beside the number.
 */
export function noiseIsApproximate(N: number): boolean {
	return Math.abs(N - 1) > IDEAL_N_TOLERANCE;
}

/** The sentence screens and the API show beside a noise figure from a model with N > 1. */
export const NOISE_APPROXIMATION_NOTE =
	'Shot noise 2q·(I + 2·IS) of the ideal junction plus the shunt’s 4kT/RSH. With an ideality factor N above 1 this is an approximation near zero bias (it gives N times the thermal value there).';
