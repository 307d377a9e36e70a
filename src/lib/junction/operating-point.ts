/**
 * A designer's operating point as the rank core reads it, and the basis a ranking judges
 * leakage on. Pure and small, so screens can import it without the catalogue table.
 */
import { DEFAULT_CONFIDENCE, DEFAULT_COVERAGE, TOLERANCE_LIMITS } from './tolerance-limits';

export { DEFAULT_CONFIDENCE, DEFAULT_COVERAGE, TOLERANCE_LIMITS };

/**
 * What leakage a ranking is judged on:
 *  - `bound`: the one-sided statistical tolerance bound over the measured samples (default);
 *  - `worst`: the largest measured sample at the operating point;
 *  - `typical`: the median sample.
 */
export const RANK_BASES = ['bound', 'worst', 'typical'] as const;
export type RankBasis = (typeof RANK_BASES)[number];
export const DEFAULT_BASIS: RankBasis = 'bound';

export interface OperatingPoint {
	/** Bias across the junction [V], positive = forward. */
	biasV: number;
	temperatureC?: number;
	temperatureRangeC?: [number, number];
	/** Forward current at which to report the forward drop [A]. */
	clampCurrentA?: number;
	/** Flag parts whose worst-case forward drop exceeds this [V]. */
	maxForwardDropV?: number;
	/** Leakage budget: flag parts whose leakage on the basis exceeds this [A]. */
	maxLeakageA?: number;
	/** Flag parts whose capacitance at the bias (median sample, mid temperature) exceeds this [F]. */
	maxCapacitanceF?: number;
	/** Flag parts whose current-noise density at the bias and hot end, on the basis, exceeds this [A/√Hz]. */
	maxNoiseA_rtHz?: number;
	/** Margin kept below the rated reverse voltage [V] (default 0). */
	reverseMarginV?: number;
	/** Keep parts biased beyond their reverse rating (flagged) instead of excluding them. */
	includeOverRating?: boolean;
	/** Source resistance in series with the junction [Ω]. */
	sourceResistanceOhm?: number;
	/** What leakage the order and the budget are judged on (default `bound`). */
	basis?: RankBasis;
	/** Fraction of parts the statistical bound covers, 0.5…0.999 (default 0.95). */
	coverage?: number;
	/** Confidence of the statistical bound, 0.5…0.999 (default 0.90). */
	confidence?: number;
}

/** The basis and the bound's coverage and confidence an operating point asks for, defaults filled in. */
export interface Judgement {
	basis: RankBasis;
	coverage: number;
	confidence: number;
}

/**
 * The judgement of an operating point, with defaults.
 * @throws RangeError for an unknown basis or a coverage or confidence outside 0.5…0.999.
 */
export function judgementOf(op: OperatingPoint): Judgement {
	const basis = op.basis ?? DEFAULT_BASIS;
	if (!(RANK_BASES as readonly string[]).includes(basis)) throw new RangeError(`basis must be one of ${RANK_BASES.join(', ')}, got '${basis}'`);
	const coverage = op.coverage ?? DEFAULT_COVERAGE;
	const confidence = op.confidence ?? DEFAULT_CONFIDENCE;
	for (const [name, v] of [
		['coverage', coverage],
		['confidence', confidence]
	] as const)
		if (!(v >= TOLERANCE_LIMITS.min && v <= TOLERANCE_LIMITS.max))
			throw new RangeError(`${name} must lie between ${TOLERANCE_LIMITS.min} and ${TOLERANCE_LIMITS.max}, got ${v}`);
	return { basis, coverage, confidence };
}

/**
 * Cold and hot ends (°C) of an operating point.
 * @throws RangeError when neither a temperature nor a valid range is given.
 */
export function temperatureEnds(op: OperatingPoint): [number, number] {
	if (op.temperatureRangeC) {
		const [a, b] = op.temperatureRangeC;
		if (!Number.isFinite(a) || !Number.isFinite(b) || a > b) throw new RangeError(`invalid temperature range [${a}, ${b}]`);
		return [a, b];
	}
	if (op.temperatureC === undefined || !Number.isFinite(op.temperatureC))
		throw new RangeError('an operating point needs temperatureC or temperatureRangeC');
	return [op.temperatureC, op.temperatureC];
}
