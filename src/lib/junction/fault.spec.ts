import { describe, expect, it } from 'vitest';
import { SI_2019, celsiusToKelvin } from './constants';
import { createModel } from './model';
import { scaleModel } from './temperature';
import { faultExcursion } from './fault';
import { NODE_PRESETS } from './node-presets';
import type { NodeNetwork, NodePosition } from './node';
import { expectRelClose } from './test-helpers';

/** Forward drop written out from the Shockley law: N·Vt·ln(I/IS(T) + 1) + I·RS (no shunt). */
function forwardDrop(IS: number, N: number, RS: number, tC: number, currentA: number): number {
	const T = celsiusToKelvin(tC);
	const is = IS * Math.exp(((T / 300.15 - 1) * 1.11) / (N * ((SI_2019.k * T) / SI_2019.q))) * (T / 300.15) ** (3 / N);
	return N * ((SI_2019.k * T) / SI_2019.q) * Math.log(currentA / is + 1) + currentA * RS;
}

const railPair: NodeNetwork = { rails: { VPOS: 5, VNEG: -5 }, signalRangeV: [-2, 2], temperatureRangeC: [0, 70] };

function at(net: NodeNetwork, positions: NodePosition[], tC: number) {
	return positions.map((p) => p.samples.map((m) => scaleModel(m, tC)));
}

describe('fault excursion', () => {
	const up = createModel({ IS: 2e-14, N: 1.03, RS: 4 });
	const down = createModel({ IS: 5e-14, N: 1.1, RS: 2 });
	const positions: NodePosition[] = [
		{ ...NODE_PRESETS['rail-pair'].junctions[0], samples: [up] },
		{ ...NODE_PRESETS['rail-pair'].junctions[1], samples: [down] }
	];

	it('is the conducting junction’s forward drop at the fault current, beyond the rail it clamps to', () => {
		for (const tC of [0, 70]) {
			const into = faultExcursion(railPair, positions, at(railPair, positions, tC), 10e-3);
			expect(into).toMatchObject({ direction: 'above', clampedTo: 'VPOS', position: 0 });
			// The other junction leaks picoamps against 10 mA: the drop is the whole excursion.
			expectRelClose(into.excursionV!, forwardDrop(2e-14, 1.03, 4, tC, 10e-3), 1e-6, `${tC} °C into`);
			expectRelClose(into.nodeV!, 5 + into.excursionV!, 1e-12);
			const out = faultExcursion(railPair, positions, at(railPair, positions, tC), -25e-3);
			expect(out).toMatchObject({ direction: 'below', clampedTo: 'VNEG', position: 1 });
			expectRelClose(out.excursionV!, forwardDrop(5e-14, 1.1, 2, tC, 25e-3), 1e-6, `${tC} °C out`);
		}
	});

	it('is larger cold than hot for a silicon clamp (the drop falls about 2 mV/K)', () => {
		const cold = faultExcursion(railPair, positions, at(railPair, positions, 0), 1e-3).excursionV!;
		const hot = faultExcursion(railPair, positions, at(railPair, positions, 70), 1e-3).excursionV!;
		expect(cold - hot).toBeGreaterThan(70 * 1.2e-3);
		expect(cold - hot).toBeLessThan(70 * 2.6e-3);
	});

	it('takes the sample with the largest drop as the worst, the median as typical', () => {
		const lot = [1, 0.3, 3].map((f) => createModel({ IS: 1e-14 * f, N: 1 }));
		const pos: NodePosition[] = [{ anode: 'node', cathode: 'VPOS', samples: lot }];
		const scaled = at(railPair, pos, 25);
		const worst = faultExcursion(railPair, pos, scaled, 1e-3, 'worst').excursionV!;
		const typical = faultExcursion(railPair, pos, scaled, 1e-3, 'typical').excursionV!;
		expectRelClose(worst, forwardDrop(0.3e-14, 1, 0, 25, 1e-3), 1e-6);
		expectRelClose(typical, forwardDrop(1e-14, 1, 0, 25, 1e-3), 1e-6);
	});

	it('clamps a guard pair to the guard, a forward drop beyond the signal-following guard', () => {
		const net: NodeNetwork = { rails: {}, guardOffsetV: 1e-3, signalRangeV: [-1, 1], temperatureRangeC: [25, 25] };
		const m = createModel({ IS: 1e-12, N: 1 });
		const pos = NODE_PRESETS['guard-pair'].junctions.map((j) => ({ ...j, samples: [m] }));
		const r = faultExcursion(net, pos, at(net, pos, 25), 1e-3);
		expect(r.clampedTo).toBe('guard');
		expectRelClose(r.excursionV!, forwardDrop(1e-12, 1, 0, 25, 1e-3), 1e-6);
		expectRelClose(r.nodeV!, 1 + 1e-3 + r.excursionV!, 1e-12);
	});

	it('says nothing clamps the node when no junction conducts in the fault’s direction', () => {
		const net: NodeNetwork = { rails: { REF: 0 }, signalRangeV: [0, 2], temperatureRangeC: [25, 25] };
		const pos: NodePosition[] = [{ anode: 'REF', cathode: 'node', samples: [createModel({ IS: 1e-14 })] }];
		expect(faultExcursion(net, pos, at(net, pos, 25), 1e-3)).toMatchObject({ excursionV: null, clampedTo: null, nodeV: null });
		expect(faultExcursion(net, pos, at(net, pos, 25), -1e-3)).toMatchObject({ clampedTo: 'REF', direction: 'below' });
	});

	it('refuses a zero fault current', () => {
		expect(() => faultExcursion(railPair, positions, at(railPair, positions, 25), 0)).toThrow(RangeError);
	});
});
