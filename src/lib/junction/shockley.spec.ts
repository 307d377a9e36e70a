import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createModel, type JunctionModel } from './model';
import {
	diodeCurrent,
	forwardVoltage,
	zeroBiasConductance,
	voltageAtCurrent,
	shuntedJunctionVoltage,
	junctionCurrent,
	junctionCurrentAndSlope
} from './shockley';
import { solveIncreasing } from './solve';
import { scaleModel, saturationCurrentAt, shuntResistanceAt } from './temperature';
import { thermalVoltage, celsiusToKelvin } from './constants';
import { junctionCapacitance } from './capacitance';
import { expectRelClose } from './test-helpers';

/**
 * Independent reference for the closed form I = B + (a/RS)·W(x): W found by bisection
 * on w + ln w = ln x (log domain), written separately from lambert-w.ts.
 */
function referenceCurrent(m: JunctionModel, V: number, tC: number): number {
	const IS = saturationCurrentAt(m, tC);
	const a = m.N * thermalVoltage(celsiusToKelvin(tC));
	const rsh = shuntResistanceAt(m, tC);
	const G = rsh === undefined ? 0 : 1 / rsh;
	if (m.RS === 0) return IS * Math.expm1(V / a) + V * G;
	const d = 1 + m.RS * G;
	const B = (V * G - IS) / d;
	const lnx = Math.log((IS * m.RS) / (d * a)) + (V - B * m.RS) / a;
	// Solve ln w + w = lnx for w > 0 by bisection on ln w.
	let lo = Math.min(lnx, 0) - 50;
	let hi = Math.max(lnx, 1) + 1;
	for (let k = 0; k < 300; k++) {
		const mid = 0.5 * (lo + hi);
		if (mid + Math.exp(mid) > lnx) hi = mid;
		else lo = mid;
	}
	const w = Math.exp(0.5 * (lo + hi));
	if (w > 1) return B + (a * w) / m.RS;
	const vd = V - B * m.RS - a * w;
	return IS * Math.expm1(vd / a) + vd * G;
}

const modelArb = fc.record({
	IS: fc.double({ min: -18, max: -6, noNaN: true }).map((e) => 10 ** e),
	N: fc.double({ min: 1, max: 2, noNaN: true }),
	RS: fc.oneof(fc.constant(0), fc.double({ min: 1e-3, max: 50, noNaN: true })),
	RSH: fc.oneof(fc.constant(undefined), fc.double({ min: 5, max: 13, noNaN: true }).map((e) => 10 ** e))
});

describe('DC equations', () => {
	it('equal an independent closed-form Lambert W evaluation within 1e-9, femtoamps included', () => {
		const cases: [number, number][] = [];
		for (const V of [-100, -10, -1, -0.3, -0.05, -0.01, -0.002, 0.002, 0.01, 0.1, 0.3, 0.6, 0.9, 1.5, 5]) cases.push([V, 25]);
		for (const V of [-5, 0.5]) for (const tC of [-55, 125, 175]) cases.push([V, tC]);
		for (const params of [
			{ IS: 1e-18, N: 1, RS: 10 },
			{ IS: 1e-15, N: 1.3, RS: 0.5, RSH: 1e12 },
			{ IS: 1e-12, N: 2, RS: 2, RSH: 1e6 },
			{ IS: 1e-8, N: 1.05, RS: 5, EG: 0.69, XTI: 2 },
			{ IS: 1e-14, N: 1, RS: 0 }
		]) {
			const m = createModel(params);
			for (const [V, tC] of cases) {
				if (m.RS === 0 && V > 2) continue;
				const eng = diodeCurrent(m, V, tC);
				expectRelClose(eng, referenceCurrent(m, V, tC), 1e-9, `IS=${m.IS} V=${V} T=${tC}:`);
			}
		}
		// A femtoamp-scale result with no floor: IS 1e-18 at −5 V is −1e-18 A scaled, not 0 or −1e-12.
		const tiny = diodeCurrent(createModel({ IS: 1e-18, N: 1, RS: 1 }), -5, 27);
		expectRelClose(tiny, -1e-18, 1e-9);
	});

	it('is monotonic in V and continuous through 0 V (property)', () => {
		fc.assert(
			fc.property(modelArb, fc.double({ min: -20, max: 1.2, noNaN: true }), fc.double({ min: -55, max: 175, noNaN: true }), (p, V, tC) => {
				const m = createModel(p);
				const dv = 1e-3;
				const i1 = diodeCurrent(m, V, tC);
				const i2 = diodeCurrent(m, V + dv, tC);
				// Non-decreasing: deep in reverse the current saturates at −IS to the last bit.
				expect(i2).toBeGreaterThanOrEqual(i1);
				if (V > -0.5) expect(i2).toBeGreaterThan(i1);
				expect(Math.sign(diodeCurrent(m, 1e-9, tC))).toBe(1);
				expect(Math.sign(diodeCurrent(m, -1e-9, tC))).toBe(-1);
				expect(diodeCurrent(m, 0, tC)).toBe(0);
				// Continuity: the slope at 0 V is the zero-bias conductance.
				const g = zeroBiasConductance(m, tC);
				expectRelClose(diodeCurrent(m, 1e-7, tC) / 1e-7, g, 1e-4);
			})
		);
	});

	it('inverts: V(I(V)) = V (property)', () => {
		fc.assert(
			fc.property(modelArb, fc.double({ min: 0.05, max: 1.0, noNaN: true }), fc.double({ min: -55, max: 175, noNaN: true }), (p, V, tC) => {
				const m = createModel(p);
				const i = diodeCurrent(m, V, tC);
				const back = voltageAtCurrent(scaleModel(m, tC), i);
				expect(Math.abs(back - V)).toBeLessThan(1e-9 + 1e-9 * Math.abs(V));
			})
		);
	});

	it('stays finite for extreme inputs (IS 1e-18, ±100 V, −55…175 °C)', () => {
		for (const p of [{ IS: 1e-18, N: 1, RS: 1 }, { IS: 1e-6, N: 2, RS: 0.01, RSH: 1e5 }, { IS: 1e-18, N: 1.5, RS: 1, BV: 50, IBV: 1e-6 }]) {
			const m = createModel(p);
			for (const V of [-100, -50, 0, 1, 100]) {
				for (const tC of [-55, 27, 175]) {
					if (m.RS === 0 && V > 2) {
						expect(() => diodeCurrent(m, V, tC)).toThrow(RangeError);
						continue;
					}
					const i = diodeCurrent(m, V, tC);
					expect(Number.isFinite(i), `${JSON.stringify(p)} ${V} V ${tC} °C`).toBe(true);
				}
			}
		}
	});

	it('gives ideality 1–2 and 0.6–0.7 V at 1 mA for typical small-signal silicon (common practice)', () => {
		// Invented parameters of the size usually seen in small-signal silicon junctions.
		const m = createModel({ IS: 4e-9, N: 1.9, RS: 0.6 });
		const vf = forwardVoltage(m, 1e-3, 25);
		expect(vf).toBeGreaterThan(0.6);
		expect(vf).toBeLessThan(0.7);
		// Ideality recovered from the slope between 10 µA and 100 µA.
		const a = forwardVoltage(m, 1e-5, 25);
		const b = forwardVoltage(m, 1e-4, 25);
		const n = (b - a) / (Math.LN10 * thermalVoltage(celsiusToKelvin(25)));
		expect(n).toBeGreaterThan(1);
		expect(n).toBeLessThan(2);
	});

	it('uses V = N·Vt·ln(I/IS + 1) + I·RS without a shunt', () => {
		const m = createModel({ IS: 1e-14, N: 1.2, RS: 3 });
		const a = 1.2 * thermalVoltage(celsiusToKelvin(27));
		expectRelClose(forwardVoltage(m, 1e-3, 27), a * Math.log(1e-3 / 1e-14 + 1) + 3e-3, 1e-14);
		expectRelClose(zeroBiasConductance(createModel({ IS: 1e-14, N: 1 }), 27), 1e-14 / thermalVoltage(300.15), 1e-14);
		expectRelClose(zeroBiasConductance(createModel({ IS: 1e-14, N: 1, RSH: 1e9 }), 27), 1e-14 / thermalVoltage(300.15) + 1e-9, 1e-14);
	});

	it('shunt-corrected forward voltage equals the bracketed Newton solve to 1e-13 (property)', () => {
		// Reference: the general solver's safeguarded Newton on Ij(Vd) = I, bracket [0, N·Vt·ln(1 + I/IS)]
		// widened by 1e-9 relative so rounding cannot leave the no-shunt end without a sign change.
		const bracketed = (s: ReturnType<typeof scaleModel>, I: number) =>
			solveIncreasing(
				(vd, out) => {
					junctionCurrentAndSlope(s, vd, out);
					out[0] -= I;
				},
				0,
				s.nvt * Math.log1p(I / s.IS) * (1 + 1e-9)
			) +
			I * s.RS;
		fc.assert(
			fc.property(
				modelArb,
				fc.double({ min: -9, max: -1, noNaN: true }),
				fc.double({ min: -40, max: 150, noNaN: true }),
				(p, logI, tC) => {
					const s = scaleModel(createModel(p), tC);
					const I = 10 ** logI;
					const v = voltageAtCurrent(s, I);
					expect(Math.abs(v - bracketed(s, I))).toBeLessThanOrEqual(1e-13 * Math.max(1, Math.abs(v)));
					// And the junction really carries I at that voltage (Ij(Vd) = I to rounding).
					const vd = shuntedJunctionVoltage(I, s.IS, s.nvt, s.GSH);
					expectRelClose(junctionCurrent(s, vd), I, 1e-9);
				}
			),
			{ numRuns: 300, seed: 11 }
		);
	});

	it('throws on out-of-domain input', () => {
		const m = createModel({ IS: 1e-14 });
		expect(() => diodeCurrent(m, NaN, 25)).toThrow(RangeError);
		expect(() => diodeCurrent(m, 0.5, -400)).toThrow(RangeError);
		expect(() => forwardVoltage(m, -1e-3, 25)).toThrow(RangeError);
		expect(() => voltageAtCurrent(scaleModel(m, 25), -1)).toThrow(RangeError);
		expect(() => createModel({ IS: -1 })).toThrow(RangeError);
		expect(() => createModel({ IS: 1e-14 }, 'unobtainium' as never)).toThrow(/unknown junction material/);
		expect(() => junctionCapacitance(m, 0, 25)).toThrow(/CJO/);
	});

	it('capacitance is continuous at FC·VJ and follows CJO·(1 − V/VJ)^−M below it', () => {
		const m = createModel({ IS: 1e-14, CJO: 1e-12, VJ: 0.8, M: 0.5, FC: 0.5 });
		expectRelClose(junctionCapacitance(m, -3, 27), 1e-12 / Math.sqrt(1 + 3 / 0.8), 1e-9);
		const below = junctionCapacitance(m, 0.4 - 1e-9, 27);
		const above = junctionCapacitance(m, 0.4 + 1e-9, 27);
		expectRelClose(below, above, 1e-7);
	});
});
