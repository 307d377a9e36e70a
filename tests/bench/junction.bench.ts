/**
 * Junction engine benchmarks (run with `npm run bench`). Relative imports only:
 * tsx does not resolve the `$lib` alias.
 */
import Papa from 'papaparse';
import { record } from './results';
import { CatalogueTable, type PartRecord } from '../../src/lib/junction/rank';
import { createModel, type JunctionModel } from '../../src/lib/junction/model';
import { fitSweepCsv } from '../../src/lib/junction/fit';
import { forwardVoltage } from '../../src/lib/junction/shockley';
import { SI_2019 } from '../../src/lib/junction/constants';
import { mulberry32 } from '../../src/lib/random';

/** Best of several timed runs, in milliseconds (warm-up first, to let the JIT settle). */
function bestOf(fn: () => unknown, runs = 15): number {
	for (let i = 0; i < 3; i++) fn();
	let best = Infinity;
	for (let i = 0; i < runs; i++) {
		const t0 = performance.now();
		fn();
		best = Math.min(best, performance.now() - t0);
	}
	return best;
}

function syntheticParts(models: number, perPart: number): PartRecord[] {
	const r = mulberry32(7);
	const parts: PartRecord[] = [];
	for (let p = 0; p < models / perPart; p++) {
		const samples: JunctionModel[] = [];
		const baseIS = 10 ** (-16 + 10 * r());
		const baseN = 1 + r();
		for (let s = 0; s < perPart; s++)
			samples.push(
				createModel({
					IS: baseIS * (0.8 + 0.4 * r()),
					N: baseN * (0.98 + 0.04 * r()),
					RS: 5 * r(),
					RSH: r() < 0.3 ? 1e8 + 1e10 * r() : undefined
				})
			);
		parts.push({
			id: `P${p}`,
			kind: 'diode',
			samples,
			ratings: { reverseV: 20 + 80 * r() },
			measured: { minAbsCurrentA: 1e-12, temperaturesC: [25, 85], reverseMeasured: true },
			fitRmsResidualV: 1e-4
		});
	}
	return parts;
}

export async function runJunctionBenchmarks(): Promise<void> {
	// (a) rank core evaluation of 100k models vs a bare loop of the plain Shockley formula.
	const N_MODELS = 100_000;
	const table = new CatalogueTable(syntheticParts(N_MODELS, 5));
	const op = { biasV: -5, temperatureC: 85 };
	const out = new Float64Array(table.sampleCount);
	const IS = new Float64Array(N_MODELS);
	const Nn = new Float64Array(N_MODELS);
	const EG = new Float64Array(N_MODELS);
	const XTI = new Float64Array(N_MODELS);
	const TN = new Float64Array(N_MODELS);
	for (let p = 0, j = 0; p < table.size; p++)
		for (const m of table.part(p).samples) {
			IS[j] = m.IS;
			Nn[j] = m.N;
			EG[j] = m.EG;
			XTI[j] = m.XTI;
			TN[j] = m.TNOM + 273.15;
			j++;
		}
	const bare = new Float64Array(N_MODELS);
	const bareLoop = () => {
		const T = 85 + 273.15;
		const vt = (SI_2019.k * T) / SI_2019.q;
		for (let j = 0; j < N_MODELS; j++) {
			const nvt = Nn[j] * vt;
			const r = T / TN[j];
			const is = IS[j] * Math.pow(r, XTI[j] / Nn[j]) * Math.exp(((r - 1) * EG[j]) / nvt);
			bare[j] = is * (Math.exp(op.biasV / nvt) - 1);
		}
	};
	const tBare = bestOf(bareLoop);
	const tCore = bestOf(() => table.sampleCurrents(op, out));
	const tRank = bestOf(() => table.rank({ ...op, clampCurrentA: 1e-3 }), 5);
	const tTop = bestOf(() => table.rank({ ...op, clampCurrentA: 1e-3 }, SI_2019, { limit: 100 }), 5);
	const ratioA = tCore / tBare;
	record(
		'rank-core-vs-bare-loop',
		ratioA,
		1.5,
		`100k models at -5 V, 85 °C: rank core ${tCore.toFixed(2)} ms, bare Shockley loop ${tBare.toFixed(2)} ms; full rank with forward drop and flags ${tRank.toFixed(1)} ms (top 100 only: ${tTop.toFixed(1)} ms)`
	);
	console.log(
		`rank-core-vs-bare-loop: ${ratioA.toFixed(2)} (core ${tCore.toFixed(2)} ms, bare ${tBare.toFixed(2)} ms, full rank ${tRank.toFixed(1)} ms, top 100 ${tTop.toFixed(1)} ms)`
	);

	// (b) parse + fit a 100k-point sweep vs papaparse parsing the same text alone.
	const model = createModel({ IS: 3e-14, N: 1.4, RS: 2 });
	const r = mulberry32(11);
	const lines = ['V (V),I (A),Trace,Range'];
	const steps = 400;
	for (let k = 0; lines.length <= 100_000; k++) {
		const e = -10 + (8 * (k % steps)) / steps;
		const i = 10 ** e;
		const v = forwardVoltage(model, i, 25);
		lines.push(`${(v + (r() - 0.5) * 4e-4).toFixed(6)},${(i * (1 + 0.02 * (r() - 0.5))).toExponential(6)},${Math.floor(k / steps)},${e < -6 ? 1 : 2}`);
	}
	const text = lines.join('\n');
	const tPapa = bestOf(() => Papa.parse(text), 7);
	let n = 0;
	const tFit = bestOf(() => {
		n = fitSweepCsv(text, { temperatureC: 25 }).model.N;
	}, 7);
	const ratioB = tFit / tPapa;
	record(
		'fit-vs-parse',
		ratioB,
		2,
		`100k-point sweep: parse+fit ${tFit.toFixed(1)} ms, papaparse alone ${tPapa.toFixed(1)} ms (fitted N ${n.toFixed(4)})`
	);
	console.log(`fit-vs-parse: ${ratioB.toFixed(2)} (parse+fit ${tFit.toFixed(1)} ms, papaparse ${tPapa.toFixed(1)} ms)`);
}
