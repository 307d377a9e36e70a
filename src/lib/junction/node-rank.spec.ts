import { describe, expect, it } from 'vitest';
import { CatalogueTable, type PartRecord } from './rank';
import { createModel, type JunctionModelInput } from './model';
import { NodeCircuit } from './node-evaluate';
import { summarizeNode } from './node-summary';
import { NODE_PRESETS } from './node-presets';
import { nodeRankRows, rankNode, type RankPosition } from './node-rank';
import type { NodeNetwork, NodePosition } from './node';
import { toleranceFactor } from './tolerance';
import { expectRelClose } from './test-helpers';

function part(id: string, base: JunctionModelInput, spread: number[], over: Partial<PartRecord> = {}): PartRecord {
	return {
		id,
		kind: 'diode',
		samples: spread.map((f) => createModel({ ...base, IS: base.IS * f, ...(base.RSH ? { RSH: base.RSH / f } : {}) })),
		ratings: { reverseV: 50, forwardCurrentA: 0.2 },
		measured: { minAbsCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true },
		fitRmsResidualV: 2e-4,
		...over
	};
}

const railPair: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };
const candidates = (net: NodeNetwork = railPair): RankPosition[] => NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, fixed: null }));

const catalogue = [
	part('tight', { IS: 2e-15, N: 1.02, RS: 4 }, [1, 1.6, 0.7]),
	part('shunted', { IS: 1e-15, N: 1.05, RS: 2, RSH: 2e11 }, [1, 2, 0.5, 1.2]),
	part('leaky', { IS: 5e-12, N: 1.3, RS: 1 }, [1, 1.1, 0.9]),
	part('single', { IS: 3e-15, N: 1, RS: 3 }, [1]),
	part('given', { IS: 1e-15, N: 1, RS: 3 }, [1], { evidence: 'given' })
];

describe('ranking catalogue parts in a protected node', () => {
	const table = new CatalogueTable(catalogue);
	const view = table.view();

	// The one-part evaluation (NodeCircuit with its bound factor, summarizeNode) is the reference.
	it('gives each part the figures of its own node evaluation on the same grid', () => {
		const res = rankNode(view, { net: railPair, positions: candidates(), faultCurrentA: 10e-3, gridPoints: 21, basis: 'worst' });
		const rows = nodeRankRows(view, res, 0, 10);
		expect(rows).toHaveLength(catalogue.length);
		for (const row of rows) {
			const rec = catalogue[row.index];
			const k = rec.evidence !== 'given' && rec.samples.length >= 2 ? toleranceFactor(rec.samples.length, 0.95, 0.9) : undefined;
			const positions: NodePosition[] = NODE_PRESETS['rail-pair'].junctions.map((j) => ({ ...j, samples: rec.samples, ...(k ? { boundFactor: k } : {}) }));
			const s = summarizeNode(new NodeCircuit(railPair, positions), { gridPoints: 21, faultCurrentA: 10e-3 });
			const ev = s.evaluation;
			expectRelClose(row.worst.netCurrentA, ev.worst.netCurrentA, 1e-9, `${rec.id} worst`);
			expect([row.worst.signalV, row.worst.temperatureC]).toEqual([ev.worst.signalV, ev.worst.temperatureC]);
			expectRelClose(row.netCurrentA.typical, Math.abs(ev.typical.netCurrentA), 1e-9, `${rec.id} typical`);
			expectRelClose(row.noiseA_rtHz.worst, ev.noise.worst.densityA_rtHz, 1e-9, `${rec.id} noise`);
			expectRelClose(row.noiseA_rtHz.typical, ev.noise.typical.densityA_rtHz, 1e-9, `${rec.id} typical noise`);
			if (k) {
				// The pass takes the bound's largest grid point; the circuit refines it between points.
				expect(row.netCurrentA.bound!).toBeLessThanOrEqual(Math.abs(ev.bound!.netCurrentA) * (1 + 1e-9));
				expect(row.netCurrentA.bound!).toBeGreaterThan(Math.abs(ev.bound!.netCurrentA) * 0.99);
				expect(row.bound).toMatchObject({ n: rec.samples.length, coverage: 0.95, confidence: 0.9 });
			} else expect(row.netCurrentA.bound).toBeNull();
			// The shortcut (conducting clamp's drop alone) against the node solved in full.
			expectRelClose(row.excursionV!.cold!, s.fault!.worst[0].excursionV!, 1e-6, `${rec.id} cold excursion`);
			expectRelClose(row.excursionV!.hot!, s.fault!.worst[1].excursionV!, 1e-6, `${rec.id} hot excursion`);
		}
	});

	it('orders by the basis: measured parts with a value first, given models and parts without a bound after', () => {
		const bound = nodeRankRows(view, rankNode(view, { net: railPair, positions: candidates() }), 0, 10);
		const ids = bound.map((r) => r.id);
		// Under the bound, 'single' (one sample) and 'given' have no value: after every part with one.
		expect(ids.slice(0, 3).sort()).toEqual(['leaky', 'shunted', 'tight']);
		expect(ids.slice(3)).toEqual(['single', 'given']);
		const values = bound.slice(0, 3).map((r) => r.netCurrentA.bound!);
		expect([...values].sort((a, b) => a - b)).toEqual(values);
		// Under the worst sample 'single' has a value and competes; 'given' still comes last.
		const worst = nodeRankRows(view, rankNode(view, { net: railPair, positions: candidates(), basis: 'worst' }), 0, 10);
		expect(worst.at(-1)!.id).toBe('given');
		expect(worst.slice(0, 4).map((r) => r.netCurrentA.worst)).toEqual([...worst.slice(0, 4).map((r) => r.netCurrentA.worst)].sort((a, b) => a - b));
	});

	it('lists parts failing a node limit after those meeting every limit, flagged', () => {
		const measured = new CatalogueTable(catalogue.slice(0, 3));
		const v = measured.view();
		const free = nodeRankRows(v, rankNode(v, { net: railPair, positions: candidates(), basis: 'worst' }), 0, 10);
		const limit = Math.sqrt(free[0].netCurrentA.worst * free[1].netCurrentA.worst);
		const res = rankNode(v, { net: railPair, positions: candidates(), basis: 'worst', limits: { maxNetCurrentA: limit } });
		const rows = nodeRankRows(v, res, 0, 10);
		expect(res.meetingLimits).toBe(1);
		expect(rows[0]).toMatchObject({ id: free[0].id, meetsLimits: true });
		for (const r of rows.slice(1)) {
			expect(r.meetsLimits).toBe(false);
			expect(r.flags).toContain('over-net-current-limit');
		}
		// An allowed error voltage is the same limit through the source resistance.
		const err = rankNode(v, { net: railPair, positions: candidates(), basis: 'worst', sourceResistanceOhm: 1e9, limits: { allowedErrorV: limit * 1e9 } });
		expect(err.meetingLimits).toBe(1);
	});

	it('orders by noise when asked, and holds a noise limit on the basis', () => {
		const byNoise = nodeRankRows(view, rankNode(view, { net: railPair, positions: candidates(), basis: 'worst', by: 'noise' }), 0, 10);
		const measured = byNoise.filter((r) => r.evidence === 'measured').map((r) => r.noiseA_rtHz.worst);
		expect(measured).toEqual([...measured].sort((a, b) => a - b));
		expect(byNoise.map((r) => r.id)).not.toEqual(nodeRankRows(view, rankNode(view, { net: railPair, positions: candidates(), basis: 'worst' }), 0, 10).map((r) => r.id));
		const cut = Math.sqrt(measured[0] * measured[1]);
		const rows = nodeRankRows(view, rankNode(view, { net: railPair, positions: candidates(), basis: 'worst', limits: { maxNoiseA_rtHz: cut } }), 0, 10);
		for (const r of rows) expect(r.flags.includes('over-noise-limit')).toBe(r.noiseA_rtHz.worst > cut);
		expect(rows.filter((r) => !r.meetsLimits).length).toBeGreaterThan(1);
	});

	it('leaves out parts whose rating the largest reverse bias exceeds, unless asked, and flags a fault over the forward rating', () => {
		const lowRated = new CatalogueTable([part('low-rated', { IS: 2e-15, N: 1 }, [1, 1.2, 0.8], { ratings: { reverseV: 6, forwardCurrentA: 1e-3 } }), catalogue[0]]);
		const v = lowRated.view();
		// Rails ±5 V and a ±2 V signal: the clamps see up to 7 V reverse.
		const res = rankNode(v, { net: railPair, positions: candidates(), faultCurrentA: 10e-3 });
		expect(res.reverseV).toBe(7);
		expect(Array.from(res.excluded)).toEqual([0]);
		expect(nodeRankRows(v, res).map((r) => r.id)).toEqual(['tight']);
		const kept = nodeRankRows(v, rankNode(v, { net: railPair, positions: candidates(), faultCurrentA: 10e-3, includeOverRating: true }));
		const row = kept.find((r) => r.id === 'low-rated')!;
		expect(row.flags).toEqual(expect.arrayContaining(['over-reverse-rating', 'over-forward-rating']));
		expect(row.meetsLimits).toBe(false);
		expect(kept[0].id).toBe('tight');
	});

	it('keeps a fixed part in its position while the candidates change, and solves shared clamps in full', () => {
		const fixed: NodePosition = { anode: 'VNEG', cathode: 'node', samples: catalogue[2].samples };
		const positions: RankPosition[] = [{ anode: 'node', cathode: 'VPOS', fixed: null }, { ...fixed, fixed }];
		const res = rankNode(view, { net: railPair, positions, faultCurrentA: -10e-3, basis: 'worst', gridPoints: 11 });
		for (const row of nodeRankRows(view, res, 0, 10)) {
			const circuit = new NodeCircuit(railPair, [{ anode: 'node', cathode: 'VPOS', samples: catalogue[row.index].samples }, fixed]);
			const s = summarizeNode(circuit, { gridPoints: 11, faultCurrentA: -10e-3, basis: 'worst' });
			expectRelClose(row.worst.netCurrentA, s.evaluation.worst.netCurrentA, 1e-9);
			// The fault draws the node down through the fixed lower clamp: the same drop for every part.
			expectRelClose(row.excursionV!.hot!, s.fault!.worst[1].excursionV!, 1e-6);
		}
		// Two clamps up to rails 0.5 V apart share a fault: each part's node is solved in full.
		const twoUp: NodeNetwork = { rails: { VPOS: 5, VAUX: 5.5 }, signalRangeV: [0, 2], temperatureRangeC: [25, 25] };
		const shared: RankPosition[] = [
			{ anode: 'node', cathode: 'VPOS', fixed: null },
			{ anode: 'node', cathode: 'VAUX', fixed: null }
		];
		const sres = rankNode(view, { net: twoUp, positions: shared, faultCurrentA: 0.1, basis: 'worst', gridPoints: 5 });
		const row = nodeRankRows(view, sres, 0, 1)[0];
		const s = summarizeNode(new NodeCircuit(twoUp, shared.map((p) => ({ ...p, samples: catalogue[row.index].samples }))), { faultCurrentA: 0.1, gridPoints: 5 });
		expectRelClose(row.excursionV!.hot!, s.fault!.worst[1].excursionV!, 1e-9);
	});

	it('refuses a node without a candidate position', () => {
		const fixed: NodePosition = { anode: 'node', cathode: 'VPOS', samples: catalogue[0].samples };
		expect(() => rankNode(view, { net: railPair, positions: [{ ...fixed, fixed }] })).toThrow(RangeError);
	});
});
