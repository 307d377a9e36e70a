/**
 * The vectorised evaluation takes one of three paths per model (model-table.ts): the
 * deep-reverse columns worked out per temperature, the plain loop (no RS, linearised RS
 * step), and the scalar solver or Lambert W. Each is held here to the scalar engine
 * (shockley.ts, itself checked against Debian's ngspice in ngspice.spec.ts) across biases
 * on both sides of the deep-reverse threshold (V ≈ −40·N·Vt, about −1 V to −2.5 V here),
 * breakdown models above and below their knee, and with a source resistance in series.
 */
import { describe, expect, it } from 'vitest';
import { ModelTable } from './model-table';
import { createModel } from './model';
import { diodeCurrent } from './shockley';
import { expectRelClose } from './test-helpers';

const models = [
	createModel({ IS: 1e-15, N: 1, RS: 0 }),
	createModel({ IS: 2e-13, N: 1.9, RS: 0 }),
	createModel({ IS: 1e-12, N: 1.8, RS: 3, RSH: 1e8 }),
	createModel({ IS: 5e-9, N: 1.05, RS: 40, RSH: 2e5 }),
	createModel({ IS: 1e-14, N: 1.1, RS: 0.5, ISR: 1e-11 }),
	createModel({ IS: 1e-14, N: 1.1, RS: 0.5, BV: 6.2 }),
	createModel({ IS: 3e-14, N: 1.3, RS: 0, RSH: 1e10, BV: 30 })
];

/** Biases from forward through the threshold region into breakdown of the 6.2 V part. */
const BIASES = [0.6, 0.05, -0.02, -0.3, -0.9, -1.02, -1.1, -1.6, -2.4, -2.6, -4, -6, -6.5, -12, -35];

describe('every evaluation path of the model table equals the scalar engine', () => {
	it('with the terminals driven directly', () => {
		const t = new ModelTable(models);
		const out = new Float64Array(models.length);
		for (const tC of [-40, 25, 85, 150])
			for (const V of BIASES) {
				t.currents(V, tC, out);
				models.forEach((m, j) => expectRelClose(out[j], diodeCurrent(m, V, tC), 1e-12, `model ${j} at ${V} V, ${tC} °C`));
			}
	});

	it('through a source resistance (every model in series with it)', () => {
		const t = new ModelTable(models);
		const out = new Float64Array(models.length);
		const extra = 1e4;
		for (const tC of [25, 125])
			for (const V of BIASES) {
				t.currents(V, tC, out, undefined, extra);
				models.forEach((m, j) =>
					expectRelClose(out[j], diodeCurrent({ ...m, RS: m.RS + extra }, V, tC), 1e-12, `model ${j} at ${V} V, ${tC} °C through ${extra} Ω`)
				);
			}
	});

	it('gives the same numbers whichever temperatures were asked for before (per-temperature columns kept apart)', () => {
		const t = new ModelTable(models);
		const first = t.currents(-3, 85, new Float64Array(models.length)).slice();
		for (const tC of [-40, 0, 25, 50, 100, 125, 150, 175, 200]) t.currents(-3, tC, new Float64Array(models.length));
		expect([...t.currents(-3, 85, new Float64Array(models.length))]).toEqual([...first]);
	});
});
