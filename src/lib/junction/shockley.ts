/**
 * Bias-point equations of the junction model (SPICE diode model, DC part).
 *
 * Intrinsic junction current at junction voltage Vd (volts across the junction):
 *   Ij(Vd) = IS·(exp(Vd/(N·Vt)) − 1)                                 Shockley term
 *          + ISR·(exp(Vd/(NR·Vt)) − 1)·((1 − Vd/VJ)² + 0.005)^(M/2)   recombination term
 *          + Vd/RSH                                                     shunt
 * and, below the breakdown knee (Vd < −BVeff), the Shockley term is replaced by
 *   −IS·exp(−(BVeff + Vd)/(NBV·Vt))
 * as in the SPICE3/ngspice diode model. Terminal voltage V = Vd + I·RS.
 * References: W. Shockley, Bell Syst. Tech. J. 28 (1949) 435; SPICE3 and ngspice 39 dioload.c.
 *
 * The reverse region uses the exact Shockley expression rather than ngspice's
 * cubic approximation, so femtoamp leakage is the model's true floor.
 */
import { SI_2019, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { lambertW0Exp } from './lambert-w';
import { scaleModel, type ScaledJunction } from './temperature';
import { solveIncreasing } from './solve';

function checkFinite(name: string, v: number): void {
	if (!Number.isFinite(v)) throw new RangeError(`${name} must be a finite number, got ${v}`);
}

/**
 * Intrinsic junction current Ij(Vd) and its slope dIj/dVd for a scaled model
 * (formula in the file header). Writes [Ij (A), dIj/dVd (S)] into `out`.
 * May return ±Infinity for absurd forward voltages; callers guard against that.
 */
export function junctionCurrentAndSlope(s: ScaledJunction, vd: number, out: Float64Array): void {
	let i: number;
	let g: number;
	if (s.hasBV && vd < -s.BVeff) {
		const e = Math.exp(-(s.BVeff + vd) / s.nbvt);
		i = -s.IS * e;
		g = (s.IS * e) / s.nbvt;
	} else {
		const x = vd / s.nvt;
		i = s.IS * Math.expm1(x);
		g = (s.IS * Math.exp(x)) / s.nvt;
	}
	if (s.ISR > 0) {
		const xr = vd / s.nrvt;
		const em1 = Math.expm1(xr);
		const u = 1 - vd / s.VJ;
		const t = u * u + 0.005;
		const k = Math.pow(t, s.M / 2);
		const dk = (-s.M * u * Math.pow(t, s.M / 2 - 1)) / s.VJ;
		i += s.ISR * em1 * k;
		g += s.ISR * ((Math.exp(xr) / s.nrvt) * k + em1 * dk);
	}
	i += vd * s.GSH;
	g += s.GSH;
	out[0] = i;
	out[1] = g;
}

const tmp = new Float64Array(2);

/** Intrinsic junction current Ij(Vd) [A] (no series resistance). */
export function junctionCurrent(s: ScaledJunction, vd: number): number {
	junctionCurrentAndSlope(s, vd, tmp);
	return tmp[0];
}

/**
 * Closed-form current of the plain Shockley junction with RS and optional shunt:
 *   I = B + (N·Vt/RS)·W0(x),  B = (V·G − IS)/(1 + RS·G),
 *   ln x = ln(IS·RS/((1 + RS·G)·N·Vt)) + (V − B·RS)/(N·Vt),  G = 1/RSH.
 * W is evaluated from ln x (lambertW0Exp) so nothing overflows. When W ≤ 1 the
 * current is rebuilt from the junction voltage Vd = V − B·RS − N·Vt·W with expm1,
 * which keeps full relative accuracy for femtoamp currents.
 * Returns the junction voltage too (Vd), which capacitance needs.
 */
function plainCurrent(s: ScaledJunction, V: number): { i: number; vd: number } {
	const a = s.nvt;
	const G = s.GSH;
	if (s.RS === 0) return { i: s.IS * Math.expm1(V / a) + V * G, vd: V };
	const d = 1 + s.RS * G;
	const B = (V * G - s.IS) / d;
	const y = Math.log((s.IS * s.RS) / (d * a)) + (V - B * s.RS) / a;
	const w = lambertW0Exp(y);
	if (w > 1) {
		const i = B + (a * w) / s.RS;
		return { i, vd: V - i * s.RS };
	}
	const vd = V - B * s.RS - a * w;
	return { i: s.IS * Math.expm1(vd / a) + vd * G, vd };
}

/**
 * Solve the terminal equation V = Vd + RS·Ij(Vd) for Vd. With only the Shockley
 * term and a shunt the Lambert W form is exact; with recombination or breakdown
 * terms there is no closed form, so a safeguarded Newton iteration runs on Vd
 * inside the bracket [min(0,V), max(0,V)] (Ij has the sign of Vd, so the root
 * must lie there), starting from the plain-diode Lambert solution.
 */
export function solveBias(s: ScaledJunction, V: number): { i: number; vd: number } {
	// Zero bias gives exactly zero current in every term; avoid rounding noise there.
	if (V === 0) return { i: 0, vd: 0 };
	if (s.ISR === 0 && !s.hasBV) return plainCurrent(s, V);
	if (s.RS === 0) return { i: junctionCurrent(s, V), vd: V };
	const start = plainCurrent(s, V).vd;
	const f = (vd: number, out: Float64Array) => {
		junctionCurrentAndSlope(s, vd, out);
		out[0] = vd + s.RS * out[0] - V;
		out[1] = 1 + s.RS * out[1];
	};
	const vd = solveIncreasing(f, Math.min(0, V), Math.max(0, V), start);
	return { i: junctionCurrent(s, vd), vd };
}

/**
 * Current through the junction at terminal bias V (forward positive) and temperature:
 * solves I = Ij(V − I·RS) (see file header) [A]. Temperatures in °C.
 * @throws RangeError for invalid inputs, or if the current is outside the double range
 *         (only possible with RS = 0 and an absurd forward bias).
 */
export function diodeCurrent(
	model: JunctionModel,
	biasV: number,
	temperatureC: number,
	constants: PhysicalConstants = SI_2019
): number {
	checkFinite('bias voltage', biasV);
	const s = scaleModel(model, temperatureC, constants);
	return currentAtBias(s, biasV);
}

/**
 * Current [A] at terminal bias V [V] for an already scaled model.
 * @throws RangeError when the result would not be a finite double.
 */
export function currentAtBias(s: ScaledJunction, biasV: number): number {
	checkFinite('bias voltage', biasV);
	const { i } = solveBias(s, biasV);
	if (!Number.isFinite(i)) throw new RangeError(`current at ${biasV} V exceeds the double range; add series resistance`);
	return i;
}

/**
 * Junction voltage Vd [V] at which a Shockley junction with a shunt carries a forward
 * current I [A]: the root of IS·(exp(Vd/(N·Vt)) − 1) + G·Vd = I, G = 1/RSH [S], I > 0.
 * Method in `shuntCorrectedVoltage`, started from the no-shunt root N·Vt·ln(1 + I/IS).
 * Source: the Shockley equation with a parallel conductance (see file header).
 * @param nvt N·Vt [V]
 */
export function shuntedJunctionVoltage(currentA: number, IS: number, nvt: number, G: number): number {
	return shuntCorrectedVoltage(currentA, IS, nvt, G, nvt * Math.log1p(currentA / IS));
}

/**
 * The shunted junction's voltage [V] (see `shuntedJunctionVoltage`) from the no-shunt root
 * vd0 = N·Vt·ln(1 + I/IS) [V]. Vd solves
 *   h(Vd) = Vd − N·Vt·ln(1 + (I − G·Vd)/IS) = 0,
 * which is increasing and convex on Vd < (I + IS)/G, so Newton's method started right of
 * the root (at min(vd0, I/G), where h ≥ 0) descends to it monotonically without
 * overshooting. At vd0, h = −N·Vt·ln(1 − u), u = G·vd0/(I + IS), exactly and without
 * cancellation; for u < 1e-4 the logarithm is −u − u²/2 − u³/3 to within u⁴/4 < 2.5e-17.
 * After a step s from x, the error is at most h''(x)/2·(s·h'(x))² (convexity; h'' falls
 * towards the root and h' ≥ 1), with h' = 1 + N·Vt·G/r, h'' = N·Vt·G²/r², r = I + IS − G·x;
 * the loop stops when that bound is below rounding, usually after one step (for 1 mA
 * through 1 MΩ the first step leaves ~1e-17 V). Exact to rounding: the same root the
 * general solver brackets. Newton on a convex function: e.g. Dahlquist & Björck,
 * Numerical Methods (1974), §6.3.
 * @param nvt N·Vt [V]
 */
export function shuntCorrectedVoltage(currentA: number, IS: number, nvt: number, G: number, vd0: number): number {
	if (G === 0) return vd0;
	let x: number;
	let h: number;
	if (G * vd0 < currentA) {
		x = vd0;
		const u = (G * vd0) / (currentA + IS);
		h = u < 1e-4 ? nvt * u * (1 + u * (0.5 + u / 3)) : -nvt * Math.log1p(-u);
	} else {
		// The shunt alone would carry more than I at vd0: start at I/G, where the junction carries nothing.
		x = currentA / G;
		h = x;
	}
	for (let k = 0; k < 100 && h > 0; k++) {
		const r = IS + currentA - G * x;
		const slope = 1 + (nvt * G) / r;
		const step = h / slope;
		const next = x - step;
		if (!(next < x)) break;
		x = next;
		const ds = step * slope;
		if (((nvt * G * G) / (2 * r * r)) * ds * ds <= 1.1e-16 * x) break;
		h = x - nvt * Math.log1p((currentA - G * x) / IS);
	}
	return x;
}

/**
 * Terminal voltage [V] that drives a given current I [A] (positive = forward):
 * V = Vd + I·RS with Ij(Vd) = I. Without ISR, a forward current has the closed form
 * V = N·Vt·ln(1 + I/IS) + I·RS, corrected exactly for a shunt by `shuntedJunctionVoltage`
 * (breakdown acts only below −BV, so it never carries forward current); otherwise a
 * safeguarded Newton solve on Vd.
 * @throws RangeError when the current cannot be reached (e.g. I ≤ −IS with no shunt or breakdown).
 */
export function voltageAtCurrent(s: ScaledJunction, currentA: number): number {
	checkFinite('current', currentA);
	if (currentA === 0) return 0;
	if (s.ISR === 0 && currentA > 0) return shuntedJunctionVoltage(currentA, s.IS, s.nvt, s.GSH) + currentA * s.RS;
	if (s.ISR === 0 && !s.hasBV && s.GSH === 0) {
		if (currentA <= -s.IS)
			throw new RangeError(`a reverse current of ${currentA} A is beyond the saturation current ${s.IS} A`);
		return s.nvt * Math.log1p(currentA / s.IS) + currentA * s.RS;
	}
	const f = (vd: number, out: Float64Array) => {
		junctionCurrentAndSlope(s, vd, out);
		out[0] -= currentA;
	};
	let lo: number;
	let hi: number;
	if (currentA > 0) {
		lo = 0;
		hi = s.nvt * Math.log1p(currentA / s.IS);
	} else {
		hi = 0;
		lo = -1;
		while (junctionCurrent(s, lo) > currentA) {
			lo *= 2;
			if (lo < -1e7) throw new RangeError(`reverse current ${currentA} A cannot be reached by this junction`);
		}
	}
	const vd = solveIncreasing(f, lo, hi);
	return vd + currentA * s.RS;
}

/**
 * Forward voltage [V] at a forward current I [A] and temperature [°C]:
 * V = N·Vt·ln(I/IS + 1) + I·RS (shunt: exact correction; recombination: solved numerically).
 * @throws RangeError for non-positive current or invalid parameters.
 */
export function forwardVoltage(
	model: JunctionModel,
	currentA: number,
	temperatureC: number,
	constants: PhysicalConstants = SI_2019
): number {
	checkFinite('current', currentA);
	if (!(currentA > 0)) throw new RangeError(`forward current must be positive, got ${currentA}`);
	return voltageAtCurrent(scaleModel(model, temperatureC, constants), currentA);
}

/**
 * Zero-bias small-signal conductance [S]:
 * G0 = 1 / (RS + 1/(IS/(N·Vt) + ISR·((1)²+0.005)^(M/2)/(NR·Vt) + 1/RSH)).
 * With RS = 0 and no ISR this is the familiar G0 = IS/(N·Vt) + 1/RSH.
 * @throws RangeError for invalid parameters or temperature.
 */
export function zeroBiasConductance(
	model: JunctionModel,
	temperatureC: number,
	constants: PhysicalConstants = SI_2019
): number {
	const s = scaleModel(model, temperatureC, constants);
	junctionCurrentAndSlope(s, 0, tmp);
	return 1 / (s.RS + 1 / tmp[1]);
}
