/**
 * Which of the stated limits a ranked part fails, and by how much, in the words the ranking
 * screen uses ("drop 1.42 V > 0.70 V"); and, when no part meets them all, the nearest misses:
 * the parts failing the fewest limits, then by the smallest overshoot (the largest ratio of
 * value to limit among the limits each fails).
 */
import { formatSI } from '$lib/junction';
import { BASIS_LABEL, type RankItem, type RankOperatingPoint, type RankResponse } from '$lib/schemas/rank';
import { amps, farads, volts } from './display';

export type LimitMiss = {
	/** The limit as the sentence names it. */
	limit: string;
	/** Value against limit, e.g. "drop 1.42 V > 0.70 V". */
	text: string;
	/** Value ÷ limit (> 1). */
	ratio: number;
};

type Ranked = Pick<RankResponse, 'basis' | 'leakageBudgetA'>;
type Item = Pick<RankItem, 'flags' | 'forwardDropV' | 'leakageA' | 'capacitanceF' | 'ratedReverseV' | 'ratedForwardA'>;

/** A forward drop in volts with two to three decimals (1.42 V, 0.70 V, 0.705 V); small ones with a prefix. */
function dropText(v: number): string {
	if (!(v >= 0.1)) return volts(v);
	const three = v.toFixed(3);
	return `${three.endsWith('0') ? v.toFixed(2) : three} V`;
}

/** The limits `item` fails at `op` (ranked as `ranked`), in the order the sentence states them. */
export function limitMisses(item: Item, op: RankOperatingPoint, ranked: Ranked): LimitMiss[] {
	const out: LimitMiss[] = [];
	const has = (f: RankItem['flags'][number]) => item.flags.includes(f);
	if (has('over-reverse-rating') && item.ratedReverseV !== null) {
		const reverse = Math.max(0, -op.biasV);
		const margin = op.reverseMarginV ?? 0;
		const asked = margin > 0 ? `reverse ${volts(reverse)} + margin ${volts(margin)}` : `reverse ${volts(reverse)}`;
		out.push({ limit: 'reverse rating', text: `${asked} > rated ${volts(item.ratedReverseV)}`, ratio: (reverse + margin) / item.ratedReverseV });
	}
	if (has('over-forward-rating') && item.ratedForwardA !== null && op.clampCurrentA !== undefined)
		out.push({
			limit: 'forward rating',
			text: `clamp ${formatSI(op.clampCurrentA, 'A')} > rated ${formatSI(item.ratedForwardA, 'A')}`,
			ratio: op.clampCurrentA / item.ratedForwardA
		});
	if (has('forward-drop-over-limit') && item.forwardDropV && op.maxForwardDropV !== undefined)
		out.push({
			limit: 'forward drop',
			text: `drop ${dropText(item.forwardDropV.worst)} > ${dropText(op.maxForwardDropV)}`,
			ratio: item.forwardDropV.worst / op.maxForwardDropV
		});
	if (has('over-leakage-target') && ranked.leakageBudgetA !== null) {
		// The value the budget was judged on: the basis, or the worst sample where a part has no bound.
		const onBasis = ranked.basis === 'bound' ? (item.leakageA.bound ?? item.leakageA.worst) : item.leakageA[ranked.basis];
		const word = ranked.basis === 'bound' && item.leakageA.bound === null ? BASIS_LABEL.worst : BASIS_LABEL[ranked.basis];
		out.push({
			limit: 'leakage budget',
			text: `leakage ${amps(onBasis)} (${word}) > ${amps(ranked.leakageBudgetA)}`,
			ratio: onBasis / ranked.leakageBudgetA
		});
	}
	if (has('over-capacitance-limit') && item.capacitanceF !== null && op.maxCapacitanceF !== undefined)
		out.push({
			limit: 'capacitance',
			text: `capacitance ${farads(item.capacitanceF)} > ${farads(op.maxCapacitanceF)}`,
			ratio: item.capacitanceF / op.maxCapacitanceF
		});
	return out;
}

/**
 * When the list has parts but none meets every limit: up to `count` nearest misses with what
 * each fails. Empty when some part meets them all (or the list is empty).
 */
export function nearestMisses<T extends Item & Pick<RankItem, 'meetsLimits'>>(
	items: readonly T[],
	op: RankOperatingPoint,
	ranked: Ranked,
	count = 3
): { item: T; misses: LimitMiss[] }[] {
	if (!items.length || items.some((i) => i.meetsLimits)) return [];
	return items
		.map((item, order) => ({ item, order, misses: limitMisses(item, op, ranked) }))
		.filter((m) => m.misses.length)
		.sort(
			(a, b) =>
				a.misses.length - b.misses.length ||
				Math.max(...a.misses.map((m) => m.ratio)) - Math.max(...b.misses.map((m) => m.ratio)) ||
				a.order - b.order
		)
		.slice(0, count)
		.map(({ item, misses }) => ({ item, misses }));
}
