/**
 * Struct-of-arrays storage of many junction models (Float64Array columns) and
 * vectorised evaluation at one operating point, for ranking large catalogues.
 *
 * The loops here allocate nothing per model. Plain models (no ISR, no BV) use the
 * same closed-form equations as shockley.ts; when the series-resistance correction
 * is below double precision (RS·(IS/(N·Vt) + 1/RSH) < 1e-17, typical for reverse
 * bias) the current is evaluated directly, which is exact to rounding. Models with
 * recombination or breakdown terms fall back to the scalar solver.
 */
import { SI_2019, celsiusToKelvin, type PhysicalConstants } from './constants';
import type { JunctionModel } from './model';
import { lambertW0Exp } from './lambert-w';
import { scaleModel } from './temperature';
import { solveBias, voltageAtCurrent } from './shockley';
import { depletionCapacitance } from './capacitance';

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
	/** 1 when the model needs the general solver (ISR or BV present). */
	readonly complex: Uint8Array;
	/** The original models, for the general solver and for reports. */
	readonly models: readonly JunctionModel[];

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
			this.complex[j] = (m.ISR !== undefined && m.ISR > 0) || m.BV !== undefined ? 1 : 0;
		}
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
		const T = celsiusToKelvin(temperatureC);
		const vt = (constants.k * T) / constants.q;
		const lnT = Math.log(T);
		const { IS, N, RS, GSH, LNSF10, EG, XTI, TNOMK, LNTNOM, complex } = this;
		const V = biasV;
		for (let j = 0; j < this.length; j++) {
			if (complex[j] === 1) {
				out[j] = this.general(j, V, temperatureC, constants, extraSeriesOhm);
				continue;
			}
			const n = N[j];
			const nvt = n * vt;
			const ratio = T / TNOMK[j];
			const is = IS[j] * Math.exp((XTI[j] * (lnT - LNTNOM[j]) + ((ratio - 1) * EG[j]) / vt) / n);
			const g = GSH[j] === 0 ? 0 : GSH[j] * Math.exp(LNSF10[j] * (T - TNOMK[j]));
			const rs = RS[j] + extraSeriesOhm;
			let i: number;
			if (rs === 0 || (V < 0 && rs * (is / nvt + g) < 1e-17)) {
				i = is * Math.expm1(V / nvt) + V * g;
			} else {
				const d = 1 + rs * g;
				const B = (V * g - is) / d;
				const w = lambertW0Exp(Math.log((is * rs) / (d * nvt)) + (V - B * rs) / nvt);
				if (w > 1) i = B + (nvt * w) / rs;
				else {
					const vd = V - B * rs - nvt * w;
					i = is * Math.expm1(vd / nvt) + vd * g;
				}
			}
			out[j] = i > Number.MAX_VALUE ? Number.MAX_VALUE : i;
		}
		return out;
	}

	private general(j: number, V: number, temperatureC: number, constants: PhysicalConstants, extraRs: number): number {
		const s = scaleModel(this.models[j], temperatureC, constants);
		if (extraRs > 0) s.RS += extraRs;
		const i = solveBias(s, V).i;
		return Number.isFinite(i) ? i : i > 0 ? Number.MAX_VALUE : -Number.MAX_VALUE;
	}

	/**
	 * Terminal voltage [V] of every model at a forward current [A] and temperature [°C]:
	 * V = N·Vt·ln(1 + I/IS(T)) + I·RS (general solver with shunt, ISR or BV), written into `out`.
	 * @throws RangeError for a non-positive current or a short output array.
	 */
	forwardVoltages(currentA: number, temperatureC: number, out: Float64Array, constants: PhysicalConstants = SI_2019): Float64Array {
		if (!(currentA > 0) || !Number.isFinite(currentA)) throw new RangeError(`forward current must be positive, got ${currentA}`);
		if (out.length < this.length) throw new RangeError('output array is shorter than the table');
		const T = celsiusToKelvin(temperatureC);
		const vt = (constants.k * T) / constants.q;
		const lnT = Math.log(T);
		const { IS, N, RS, GSH, EG, XTI, TNOMK, LNTNOM, complex } = this;
		for (let j = 0; j < this.length; j++) {
			if (complex[j] === 1 || GSH[j] !== 0) {
				out[j] = voltageAtCurrent(scaleModel(this.models[j], temperatureC, constants), currentA);
				continue;
			}
			const nvt = N[j] * vt;
			const ratio = T / TNOMK[j];
			const is = IS[j] * Math.exp((XTI[j] * (lnT - LNTNOM[j]) + ((ratio - 1) * EG[j]) / vt) / N[j]);
			out[j] = nvt * Math.log1p(currentA / is) + currentA * RS[j];
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
		const s = scaleModel(this.models[j], temperatureC, constants);
		return depletionCapacitance(s, solveBias(s, biasV).vd);
	}
}
