/**
 * Struct-of-arrays storage of many junction models (Float64Array columns) and
 * vectorised evaluation at one operating point, for ranking large catalogues.
 *
 * The loops here allocate nothing per model. Plain models (no ISR, no BV) use the
 * same closed-form equations as shockley.ts, with two shortcuts for reverse bias. Deep in
 * reverse, where the junction voltage Vd = V − I·RS lies below −40·N·Vt, the exponential
 * is below 4.3e-18 of IS, under double rounding, so I = (V/RSH − IS)/(1 + RS/RSH) exactly
 * to rounding (the Lambert W form's B term alone). Otherwise, when
 * ε = RS·(IS/(N·Vt) + 1/RSH) < 1e-9 (typical), the current is I₀·(1 − RS·Ij'(V)) with
 * I₀ = Ij(V) the current without RS. That is one linearised step of I = Ij(V − I·RS); as
 * Ij' ≤ IS/(N·Vt) + 1/RSH for V ≤ 0, its relative error is below 3ε² < 3e-18, under
 * double rounding, so it is exact to rounding like the Lambert W form it replaces. A breakdown
 * model biased above its knee (V ≥ −BVeff, so the junction never reaches the breakdown
 * branch) is a plain model there. Forward voltages use the closed form with the exact
 * shunt correction (`shuntedJunctionVoltage`) for every model without ISR. Only models
 * with a recombination term, or biased into breakdown, fall back to the scalar solver.
 *
 * Temperature-scaled parameters (IS(T), 1/RSH(T), the deep-reverse current's slope and
 * offset and the bias below which they hold, each model's breakdown knee, and the full
 * scaled model where the solver or the capacitance needs it) are kept per temperature for the last
 * SCALED_TEMPERATURES temperatures asked for, so repeated evaluations at the same
 * temperatures skip the scaling. The table is immutable, so these never go stale; a
 * catalogue refresh builds a new table and with it an empty cache.
 */
import { SI_2019, celsiusToKelvin, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { lambertW0Exp } from './lambert-w';
import { scaleModel, type ScaledJunction } from './temperature';
import { shuntCorrectedVoltage, solveBias, voltageAtCurrent } from './shockley';
import { depletionCapacitance } from './capacitance';

/** How many temperatures' scaled parameters a table keeps (least recently used dropped). */
const SCALED_TEMPERATURES = 8;

/** Every model's temperature-dependent parameters at one temperature. */
interface ScaledColumns {
	temperatureC: number;
	constants: PhysicalConstants;
	/** Thermal voltage k·T/q [V]. */
	vt: number;
	/** IS(T) [A]. */
	IS: Float64Array;
	/** ln IS(T) [ln A]. */
	LNIS: Float64Array;
	/** 1/RSH(T) [S], 0 = no shunt. */
	GSH: Float64Array;
	/**
	 * Deep in reverse (file header) the current is V·SLOPE − OFFSET with SLOPE = G/d and
	 * OFFSET = IS(T)/d, d = 1 + RS·G, for a bias below DEEP_BELOW = d·(−40·N·Vt − RS·OFFSET)
	 * [V] (the junction voltage then lies below −40·N·Vt); −Infinity for a model with ISR or BV.
	 * Without a source resistance; kept per temperature so the loop at a bias divides nothing.
	 */
	DEEP_BELOW: Float64Array;
	SLOPE: Float64Array;
	OFFSET: Float64Array;
	/**
	 * The bias [V] below which model j needs the scalar solver: +Infinity with ISR, −BV(T)
	 * with breakdown (above its knee the junction never enters breakdown), −Infinity else.
	 */
	KNEE: Float64Array;
	/** Full scaled models, built on first use (solver and capacitance only). */
	full: (ScaledJunction | undefined)[];
}

export class ModelTable {
	readonly length: number;
	readonly IS: Float64Array;
	readonly N: Float64Array;
	readonly RS: Float64Array;
	/** 1/RSH at TNOM [S]; 0 = no shunt. */
	readonly GSH: Float64Array;
	readonly shuntFactor: Float64Array;
	/** ln(shunt factor)/10 K, so the loop needs exp rather than pow. */
	readonly LNSF10: Float64Array;
	readonly EG: Float64Array;
	readonly XTI: Float64Array;
	/** TNOM in kelvin. */
	readonly TNOMK: Float64Array;
	/** ln(TNOM/K), precomputed because the ranking loop needs it for every model. */
	readonly LNTNOM: Float64Array;
	readonly CJO: Float64Array;
	/** 1 when the model has a recombination or breakdown term (ISR or BV present). */
	readonly complex: Uint8Array;
	/** 1 when the model has a recombination term (ISR > 0): forward voltage needs the solver. */
	readonly hasISR: Uint8Array;
	/** The original models, for the general solver and for reports. */
	readonly models: readonly JunctionModel[];
	private scaledCache = new Map<number, ScaledColumns>();
	/** Models `currents` leaves to the solver, one call's worth. */
	private restScratch: Int32Array | undefined;

	constructor(models: readonly JunctionModel[]) {
		const n = models.length;
		this.length = n;
		this.models = models;
		this.IS = new Float64Array(n);
		this.N = new Float64Array(n);
		this.RS = new Float64Array(n);
		this.GSH = new Float64Array(n);
		this.shuntFactor = new Float64Array(n);
		this.LNSF10 = new Float64Array(n);
		this.EG = new Float64Array(n);
		this.XTI = new Float64Array(n);
		this.TNOMK = new Float64Array(n);
		this.LNTNOM = new Float64Array(n);
		this.CJO = new Float64Array(n);
		this.complex = new Uint8Array(n);
		this.hasISR = new Uint8Array(n);
		for (let j = 0; j < n; j++) {
			const m = models[j];
			this.IS[j] = m.IS;
			this.N[j] = m.N;
			this.RS[j] = m.RS;
			this.GSH[j] = m.RSH === undefined ? 0 : 1 / m.RSH;
			this.shuntFactor[j] = m.shuntFactorPer10K;
			this.LNSF10[j] = Math.log(m.shuntFactorPer10K) / 10;
			this.EG[j] = m.EG;
			this.XTI[j] = m.XTI;
			this.TNOMK[j] = celsiusToKelvin(m.TNOM);
			this.LNTNOM[j] = Math.log(this.TNOMK[j]);
			this.CJO[j] = m.CJO ?? 0;
			this.hasISR[j] = m.ISR !== undefined && m.ISR > 0 ? 1 : 0;
			this.complex[j] = this.hasISR[j] === 1 || m.BV !== undefined ? 1 : 0;
		}
	}

	/**
	 * IS(T) = IS·(T/Tnom)^(XTI/N)·exp((T/Tnom − 1)·EG/(N·Vt)) [A] and 1/RSH(T) = f^((T − Tnom)/10 K)/RSH [S]
	 * of every model at a temperature [°C] (temperature.ts; ngspice diotemp.c), kept for reuse.
	 * @throws RangeError for a temperature at or below absolute zero.
	 */
	private scaled(temperatureC: number, constants: PhysicalConstants): ScaledColumns {
		const cache = this.scaledCache;
		const hit = cache.get(temperatureC);
		if (hit && hit.constants === constants) {
			// Most recently used last.
			cache.delete(temperatureC);
			cache.set(temperatureC, hit);
			return hit;
		}
		const T = celsiusToKelvin(temperatureC);
		const vt = (constants.k * T) / constants.q;
		const lnT = Math.log(T);
		const n = this.length;
		const IS = new Float64Array(n);
		const LNIS = new Float64Array(n);
		const G = new Float64Array(n);
		for (let j = 0; j < n; j++) {
			const ratio = T / this.TNOMK[j];
			const lnFactor = (this.XTI[j] * (lnT - this.LNTNOM[j]) + ((ratio - 1) * this.EG[j]) / vt) / this.N[j];
			IS[j] = this.IS[j] * Math.exp(lnFactor);
			LNIS[j] = Math.log(this.IS[j]) + lnFactor;
			G[j] = this.GSH[j] === 0 ? 0 : this.GSH[j] * Math.exp(this.LNSF10[j] * (T - this.TNOMK[j]));
		}
		const DEEP_BELOW = new Float64Array(n);
		const SLOPE = new Float64Array(n);
		const OFFSET = new Float64Array(n);
		for (let j = 0; j < n; j++) {
			const rs = this.RS[j];
			const d = 1 + rs * G[j];
			SLOPE[j] = G[j] / d;
			OFFSET[j] = IS[j] / d;
			DEEP_BELOW[j] = this.complex[j] === 1 ? -Infinity : d * (-40 * this.N[j] * vt - rs * OFFSET[j]);
		}
		const cols: ScaledColumns = { temperatureC, constants, vt, IS, LNIS, GSH: G, DEEP_BELOW, SLOPE, OFFSET, KNEE: new Float64Array(n).fill(-Infinity), full: new Array(n) };
		for (let j = 0; j < n; j++) {
			if (this.complex[j] === 0) continue;
			const s = this.full(cols, j);
			cols.KNEE[j] = s.ISR !== 0 ? Infinity : -s.BVeff;
		}
		cache.delete(temperatureC);
		cache.set(temperatureC, cols);
		if (cache.size > SCALED_TEMPERATURES) cache.delete(cache.keys().next().value as number);
		return cols;
	}

	/** The full scaled model j at the columns' temperature (built once per temperature). */
	private full(cols: ScaledColumns, j: number): ScaledJunction {
		return (cols.full[j] ??= scaleModel(this.models[j], cols.temperatureC, cols.constants));
	}

	/**
	 * Currents [A] of every model at terminal bias V [V] and temperature [°C], written into `out`.
	 * Same equations as `diodeCurrent` (Shockley + RS + RSH with Lambert W; temperature scaling
	 * as ngspice). `extraSeriesOhm` adds a source resistance in series with every model.
	 * Results are always finite: a current beyond the double range is clamped to ±Number.MAX_VALUE.
	 * @throws RangeError for a non-finite bias, an invalid temperature or a short output array.
	 */
	currents(
		biasV: number,
		temperatureC: number,
		out: Float64Array,
		constants: PhysicalConstants = SI_2019,
		extraSeriesOhm = 0
	): Float64Array {
		if (!Number.isFinite(biasV)) throw new RangeError(`bias must be finite, got ${biasV}`);
		if (out.length < this.length) throw new RangeError('output array is shorter than the table');
		if (!(extraSeriesOhm >= 0)) throw new RangeError('series resistance must be ≥ 0');
		const cols = this.scaled(temperatureC, constants);
		const rest = (this.restScratch ??= new Int32Array(this.length));
		// Each in a loop without calls (V8 then keeps its columns in registers): the models deep
		// in reverse from the temperature's columns, then the other plain ones, then those
		// needing the solver or Lambert W.
		const deep = extraSeriesOhm === 0 ? deepCurrents(biasV, cols.DEEP_BELOW, cols.SLOPE, cols.OFFSET, out, rest) : allIndices(rest);
		const m = plainCurrents(biasV, cols.vt, this.N, this.RS, cols.IS, cols.GSH, cols.KNEE, extraSeriesOhm, out, rest, deep);
		for (let k = 0; k < m; k++) out[rest[k]] = this.solvedCurrent(cols, rest[k], biasV, extraSeriesOhm);
		return out;
	}

	/** Model j's current where `plainCurrents` left it: the solver, or Lambert W with RS. */
	private solvedCurrent(cols: ScaledColumns, j: number, V: number, extraSeriesOhm: number): number {
		if (V < cols.KNEE[j]) return general(this.full(cols, j), V, extraSeriesOhm);
		const is = cols.IS[j];
		const nvt = this.N[j] * cols.vt;
		const g = cols.GSH[j];
		const rs = this.RS[j] + extraSeriesOhm;
		const d = 1 + rs * g;
		const B = (V * g - is) / d;
		let i: number;
		const w = lambertW0Exp(Math.log((is * rs) / (d * nvt)) + (V - B * rs) / nvt);
		if (w > 1) i = B + (nvt * w) / rs;
		else {
			const vd = V - B * rs - nvt * w;
			i = is * Math.expm1(vd / nvt) + vd * g;
		}
		return i > Number.MAX_VALUE ? Number.MAX_VALUE : i;
	}

	/**
	 * Current-noise power density [A²/Hz] of every model at terminal bias V [V] and temperature
	 * [°C], from the currents `currents` gives at that bias and temperature:
	 *   2q·(IS(T)·expm1(V_j/(N·Vt)) + 2·IS(T)) + 4k·T/RSH(T),  V_j = V − I·RS
	 * (noise.ts: ideal-junction shot noise after van der Ziel, and the shunt's Nyquist noise).
	 * @throws RangeError for a short input or output array.
	 */
	noisePowers(biasV: number, temperatureC: number, currentsA: Float64Array, out: Float64Array, constants: PhysicalConstants = SI_2019): Float64Array {
		if (currentsA.length < this.length || out.length < this.length) throw new RangeError('arrays are shorter than the table');
		const cols = this.scaled(temperatureC, constants);
		for (let j = 0; j < this.length; j++) out[j] = this.noiseOf(cols, j, biasV, currentsA[j], constants);
		return out;
	}

	/**
	 * Current-noise power density [A²/Hz] of model j at terminal bias V [V] and temperature [°C]
	 * carrying the current `currentA` it carries there (as `noisePowers`, for one model).
	 */
	noisePowerAt(j: number, biasV: number, currentA: number, temperatureC: number, constants: PhysicalConstants = SI_2019): number {
		return this.noiseOf(this.scaled(temperatureC, constants), j, biasV, currentA, constants);
	}

	private noiseOf(cols: ScaledColumns, j: number, biasV: number, currentA: number, constants: PhysicalConstants): number {
		const is = cols.IS[j];
		const vd = biasV - currentA * this.RS[j];
		const shot = is * Math.expm1(vd / (this.N[j] * cols.vt)) + 2 * is;
		// 4kT with T = q·Vt/k.
		const s = 2 * constants.q * (shot > 0 ? shot : 0) + 4 * constants.q * cols.vt * cols.GSH[j];
		return s > Number.MAX_VALUE ? Number.MAX_VALUE : s;
	}

	/**
	 * Terminal voltage [V] of every model at a forward current [A] and temperature [°C]:
	 * V = N·Vt·ln(1 + I/IS(T)) + I·RS, with the exact shunt correction of
	 * `shuntCorrectedVoltage` when there is a shunt, and the general solver for models
	 * with a recombination term (ISR); written into `out`. ln(1 + I/IS) = ln I − ln IS +
	 * ln(1 + x), x = IS(T)/I; when x < 1e-4 the last term is x − x²/2 + x³/3 to within
	 * x⁴/4 < 2.5e-17, so with the kept ln IS(T) column the loop needs no logarithm.
	 * @throws RangeError for a non-positive current or a short output array.
	 */
	forwardVoltages(currentA: number, temperatureC: number, out: Float64Array, constants: PhysicalConstants = SI_2019): Float64Array {
		if (!(currentA > 0) || !Number.isFinite(currentA)) throw new RangeError(`forward current must be positive, got ${currentA}`);
		if (out.length < this.length) throw new RangeError('output array is shorter than the table');
		const cols = this.scaled(temperatureC, constants);
		const vt = cols.vt;
		const { N, RS, hasISR } = this;
		const { IS, LNIS, GSH } = cols;
		const lnI = Math.log(currentA);
		const invI = 1 / currentA;
		for (let j = 0; j < this.length; j++) {
			if (hasISR[j] === 1) {
				out[j] = voltageAtCurrent(this.full(cols, j), currentA);
				continue;
			}
			const nvt = N[j] * vt;
			const is = IS[j];
			const x = is * invI;
			const vd0 = x < 1e-4 ? nvt * (lnI - LNIS[j] + x * (1 - x * (0.5 - x / 3))) : nvt * Math.log1p(currentA / is);
			const vd = GSH[j] === 0 ? vd0 : shuntCorrectedVoltage(currentA, is, nvt, GSH[j], vd0);
			out[j] = vd + currentA * RS[j];
		}
		return out;
	}

	/**
	 * Depletion capacitance [F] of one model at terminal bias [V] and temperature [°C]
	 * (SPICE depletion formula; 0 when CJO is unknown).
	 * @throws RangeError for invalid inputs.
	 */
	capacitance(j: number, biasV: number, temperatureC: number, constants: PhysicalConstants = SI_2019): number {
		if (this.CJO[j] === 0) return 0;
		const s = this.full(this.scaled(temperatureC, constants), j);
		return depletionCapacitance(s, solveBias(s, biasV).vd);
	}
}

/** Current of a scaled model by the general solver, with an optional extra series resistance; always finite. */
function general(s: ScaledJunction, V: number, extraRs: number): number {
	const i = solveBias(extraRs > 0 ? { ...s, RS: s.RS + extraRs } : s, V).i;
	return Number.isFinite(i) ? i : i > 0 ? Number.MAX_VALUE : -Number.MAX_VALUE;
}

/**
 * The currents of the models deep in reverse at bias V into `out` (`ScaledColumns.DEEP_BELOW`);
 * the others' indices into `rest`, whose count is returned.
 */
function deepCurrents(V: number, deepBelow: Float64Array, slope: Float64Array, offset: Float64Array, out: Float64Array, rest: Int32Array): number {
	let m = 0;
	// The bound in a local: read from the array, V8 reloads it every step (the loop stores).
	const n = deepBelow.length;
	for (let j = 0; j < n; j++) {
		if (V < deepBelow[j]) out[j] = V * slope[j] - offset[j];
		else rest[m++] = j;
	}
	return m;
}

/** Every model's index into `rest`; returns the count. */
function allIndices(rest: Int32Array): number {
	for (let j = 0; j < rest.length; j++) rest[j] = j;
	return rest.length;
}

/**
 * The currents of the first `count` models listed in `rest` into `out` where no solver and
 * no Lambert W is needed: deep in reverse, without RS, or with the linearised RS step (file
 * header). Those it cannot do stay in `rest`, in order, and their count is returned.
 */
function plainCurrents(
	V: number,
	vt: number,
	N: Float64Array,
	RS: Float64Array,
	IS: Float64Array,
	GSH: Float64Array,
	knee: Float64Array,
	extraSeriesOhm: number,
	out: Float64Array,
	rest: Int32Array,
	count: number
): number {
	let m = 0;
	const reverse = V < 0;
	for (let r = 0; r < count; r++) {
		const j = rest[r];
		if (V < knee[j]) {
			rest[m++] = j;
			continue;
		}
		const is = IS[j];
		const nvt = N[j] * vt;
		const g = GSH[j];
		const rs = RS[j] + extraSeriesOhm;
		// Without a shunt the quotient is −IS exactly.
		const B = g === 0 ? -is : (V * g - is) / (1 + rs * g);
		// Reverse currents are negative and finite: only a forward one can need the clamp.
		if (reverse && V - B * rs < -40 * nvt) out[j] = B;
		else if (rs === 0) {
			const i = is * Math.expm1(V / nvt) + V * g;
			out[j] = i > Number.MAX_VALUE ? Number.MAX_VALUE : i;
		} else if (reverse && rs * (is / nvt + g) < 1e-9) {
			const em1 = Math.expm1(V / nvt);
			out[j] = (is * em1 + V * g) * (1 - rs * ((is * (em1 + 1)) / nvt + g));
		} else rest[m++] = j;
	}
	return m;
}
