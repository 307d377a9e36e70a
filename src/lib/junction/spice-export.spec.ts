/**
 * Every kind of exported block simulated in ngspice 39 (run here, never pasted numbers)
 * against the engine: reverse, near-zero and forward bias, 0…125 °C, parts with a shunt
 * (two shunt factors), breakdown and a recombination term. Within 1e-4 relative, and
 * 0.5 % below −3·N·Vt where ngspice replaces Shockley by its cubic reverse approximation;
 * ngspice's GMIN is set to zero in the test deck (not in the exported text).
 */
import { describe, expect, it } from 'vitest';
import { blockCurrents } from '../../../tests/reference/ngspice';
import { celsiusToKelvin, CODATA_2014, thermalVoltage } from './constants';
import { createModel, type JunctionModelInput } from './model';
import { diodeCurrent } from './shockley';
import { parseModelCards } from './spice-card';
import { asciiText, emitSpiceBlock, needsSubcircuit, shuntTce, spiceIdentifier, spiceNumber } from './spice-export';
import { relativeDifference } from './test-helpers';

// Invented parts, one per kind of block.
const PARTS: [string, JunctionModelInput][] = [
	['plain', { IS: 2.345678912e-15, N: 1.07, RS: 1.5 }],
	['shunt', { IS: 1e-15, N: 1.02, RS: 0.8, RSH: 3.3e11 }],
	['shunt-no-rs', { IS: 4e-14, N: 1.3, RS: 0, RSH: 5e9, shuntFactorPer10K: 1.7 }],
	['breakdown', { IS: 1e-14, N: 1.1, RS: 0.5, BV: 6.2, IBV: 1e-3 }],
	['breakdown-nbv', { IS: 2e-15, N: 1, RS: 2, BV: 4.7, IBV: 1e-4, NBV: 1.5 }],
	['recombination', { IS: 1e-14, N: 1, RS: 0.3, ISR: 1e-11, NR: 2 }],
	['everything', { IS: 3e-15, N: 1.05, RS: 1.2, RSH: 2e10, ISR: 5e-12, NR: 2.2, BV: 9, IBV: 1e-5, CJO: 5e-12, VJ: 0.7, M: 0.4, TNOM: 25 }],
	['jfet-like', { IS: 5e-16, N: 1.02, RS: 30, RSH: 1e12, EG: 1.12, XTI: 3, TNOM: 25 }]
];
const TEMPS_C = [0, 27, 70, 125];
const BIASES_V = [-8, -5, -1, -0.1, -1e-3, 0, 1e-3, 0.2, 0.45, 0.65];

describe('exported SPICE blocks against ngspice', () => {
	for (const [label, input] of PARTS) {
		it(`${label}: ${needsSubcircuit(createModel(input)) ? 'subcircuit' : '.model'} agrees with the engine`, () => {
			const model = createModel(input);
			const block = emitSpiceBlock({ name: `P_${label.replace(/-/g, '_')}`, model, comments: ['test part'] });
			for (const tC of TEMPS_C) {
				const currents = blockCurrents(block, tC, BIASES_V);
				const vt = thermalVoltage(celsiusToKelvin(tC), CODATA_2014);
				BIASES_V.forEach((v, k) => {
					const sim = currents[k];
					const want = diodeCurrent(model, v, tC);
					if (v === 0) return expect(Math.abs(sim)).toBeLessThan(1e-25);
					const tol = v < -3 * model.N * vt ? 5e-3 : 1e-4;
					expect(relativeDifference(sim, want), `${label} at ${v} V, ${tC} °C: ngspice ${sim}, engine ${want}`).toBeLessThan(tol);
				});
			}
		});
	}

	it('writes ASCII only, 7 significant digits, lines under 80 characters, and its .model cards read back', () => {
		const model = createModel(PARTS[6][1]);
		const block = emitSpiceBlock({ name: 'QX-1', model, comments: ['JFET gate junction – 25 °C, 1 µA, 1 GΩ'] });
		expect(block).toMatch(/^[\x20-\x7e\n]*$/);
		expect(block).toContain('25 degC, 1 uA, 1 GOhm');
		for (const line of block.split('\n')) expect(line.length).toBeLessThan(80);
		expect(block).toMatch(/IS=3e-15 /);
		const [card] = parseModelCards(block);
		expect(card.model.IS).toBe(3e-15);
		expect(card.model.RS).toBe(0);
		expect(block).toMatch(/^Rser anode j 1\.2$/m);
		expect(spiceNumber(1.23456789e-14)).toBe('1.234568e-14');
		expect(spiceNumber(27)).toBe('27');
	});

	it('gives tce = −ln f / (10·ln 1.01): a factor 2 per 10 K is −6.96607', () => {
		// ngspice manual, resistor: R(T) = R(TNOM)·1.01^(TCE·(T − TNOM)); 2 per 10 K ⇒ 1.01^(10·tce) = 1/2.
		expect(shuntTce(2)).toBeCloseTo(-6.96607, 5);
		expect(1.01 ** (10 * shuntTce(1.7))).toBeCloseTo(1 / 1.7, 12);
	});

	it('names blocks as SPICE identifiers, unique within a library', () => {
		const taken = new Set<string>();
		expect(spiceIdentifier('QVL-D9', taken)).toBe('QVL-D9');
		expect(spiceIdentifier('qvl-d9', taken)).toBe('qvl-d9_2');
		expect(spiceIdentifier('1N/41', taken)).toBe('D1N_41');
		expect(asciiText('BJT base–emitter')).toBe('BJT base-emitter');
	});
});
