import { describe, it } from 'vitest';
import { createModel } from './model';
import { ModelTable } from './model-table';
import { scaleModel } from './temperature';
import { solveBias } from './shockley';
import { noisePower } from './noise';
import { expectRelClose } from './test-helpers';

describe('ModelTable.noisePowers', () => {
	it('equals the scalar noise of each model at its junction voltage, RS and shunts included', () => {
		const models = [
			createModel({ IS: 1e-14, N: 1 }),
			createModel({ IS: 3e-12, N: 1.6, RS: 40, RSH: 2e9 }),
			createModel({ IS: 5e-9, N: 1.05, RS: 2 }, 'metal-semiconductor'),
			createModel({ IS: 1e-15, N: 1.1, RSH: 1e12, shuntFactorPer10K: 1.7, ISR: 1e-12 })
		];
		const table = new ModelTable(models);
		const i = new Float64Array(models.length);
		const out = new Float64Array(models.length);
		for (const tC of [-20, 25, 100])
			for (const v of [-7, -0.05, 0, 0.01, 0.45]) {
				table.currents(v, tC, i);
				table.noisePowers(v, tC, i, out);
				models.forEach((m, j) => {
					const s = scaleModel(m, tC);
					expectRelClose(out[j], noisePower(s, solveBias(s, v).vd), 1e-9, `model ${j} at ${v} V, ${tC} °C`);
				});
			}
	});
});
