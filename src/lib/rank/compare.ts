/**
 * The compare page's order and its best values. Parts stand in the ranking's own order
 * (meeting every limit first, measured before given-model-only, a value on the basis before
 * none, then that value, typical leakage breaking ties), so the columns do not follow the
 * order in which they were ticked; per row, the best value is the lowest (the highest for
 * the reverse margin).
 */
import type { RankBasis, RankItem } from '$lib/schemas/rank';

type Ordered = Pick<RankItem, 'meetsLimits' | 'evidence' | 'leakageA' | 'partNumber'>;

/** The leakage a part is ranked by on `basis` (NaN when it has none, e.g. no bound). */
export function onBasis(item: Pick<RankItem, 'leakageA'>, basis: RankBasis): number {
	const v = item.leakageA[basis];
	return v === null ? NaN : v;
}

/** `items` in ranking order for `basis` (a new array). */
export function inRankOrder<T extends Ordered>(items: readonly T[], basis: RankBasis): T[] {
	const missing = (v: number) => (Number.isNaN(v) ? 1 : 0);
	return [...items].sort((a, b) => {
		const va = onBasis(a, basis);
		const vb = onBasis(b, basis);
		return (
			Number(b.meetsLimits) - Number(a.meetsLimits) ||
			Number(a.evidence === 'given') - Number(b.evidence === 'given') ||
			missing(va) - missing(vb) ||
			(missing(va) ? 0 : va - vb) ||
			a.leakageA.typical - b.leakageA.typical ||
			a.partNumber.localeCompare(b.partNumber)
		);
	});
}

/**
 * Indices of the best value among `values` (lowest, or highest with `highest`); empty when
 * fewer than two parts have a value or all values are equal (nothing to pick between).
 */
export function bestOf(values: readonly (number | null | undefined)[], highest = false): number[] {
	const known = values.map((v, i) => [v, i] as const).filter((p): p is readonly [number, number] => typeof p[0] === 'number' && Number.isFinite(p[0]));
	if (known.length < 2) return [];
	const pick = highest ? Math.max(...known.map(([v]) => v)) : Math.min(...known.map(([v]) => v));
	if (known.every(([v]) => v === pick)) return [];
	return known.filter(([v]) => v === pick).map(([, i]) => i);
}
