/**
 * The rank core: catalogue parts ranked for a designer's operating point. This file is its
 * public surface and the one statement of what the numbers and the order mean; the work
 * is split by job:
 *  - operating-point.ts  the operating point, the basis (bound / worst / typical), temperature ends;
 *  - rank-flags.ts       the flag vocabulary (codes, words, bits, which flags are limits);
 *  - catalogue-table.ts  the in-memory table: evaluation and the result's columns;
 *  - rank-pass.ts        per-part statistics, flags and groups, with what no operating point changes prepared once;
 *  - bounds-on-demand.ts statistical bounds computed only where the order or the list needs them;
 *  - catalogue-noise.ts  the current-noise figures and the noise limit;
 *  - rank-order.ts       ordering and selection of part indices by key columns;
 *  - rank-select.ts      a short list selected in one pass, only its parts flagged;
 *  - tolerance.ts        the noncentral-t tolerance factor and the log-normal bound;
 *  - rank-types.ts       records in, columns and rows out.
 *
 * Definitions (every sample model is evaluated at the operating point itself):
 *  - leakage = |I(biasV)| at the hot end of the temperature range; typical = median over
 *    samples, worst = the largest sample at that point;
 *  - statistical bound = exp(ȳ + k·s) over y = ln|I| of the measured samples, s the sample
 *    standard deviation (n − 1), k the one-sided normal tolerance factor for coverage p and
 *    confidence γ (defaults 0.95 and 0.90) from the noncentral t (tolerance.ts). Lot-to-lot
 *    leakage taken as log-normal is common practice. Parts with one sample, or with only a
 *    given model, have no bound;
 *  - forward drop at clampCurrentA at the hot and cold ends (median over samples each);
 *    worst = largest over samples and both ends. The cold end is usually higher (the
 *    junction voltage falls with temperature), but a model with a large N and little
 *    temperature dependence of IS (wide-gap, N ≈ 2) can have the hot end higher;
 *  - capacitance at the bias (median over samples at the mid temperature) when CJO is known;
 *  - current noise at the bias and hot end (noise.ts; catalogue-noise.ts): each sample's
 *    density, typical = median, worst = noisiest, bound = the same tolerance bound over the
 *    samples' noise powers.
 * Basis: the designer chooses what leakage the list is judged on: the bound (default), the
 * worst sample or typical.
 * Limits: an operating point may state a forward-drop limit (maxForwardDropV), a leakage
 * budget (maxLeakageA, held against the leakage on the basis, or against the worst sample
 * for a part without a value on the basis) and a capacitance limit (maxCapacitanceF); a
 * clamp current above the part's rated forward current and a reverse bias beyond its
 * rating (less the margin) are limits too, and so is a noise limit (maxNoiseA_rtHz, held
 * against the noise on the basis like the leakage budget). A part failing one raises its flag. Parts
 * beyond their reverse rating are left out unless includeOverRating. A part whose
 * capacitance is unknown (no CJO) is not held against the capacitance limit.
 * Order (ignorance never ranks first):
 *  1. parts meeting every stated limit, then the parts failing one; within each,
 *  2. measured parts before parts with only a given model; within each,
 *  3. parts with a value on the basis before those without (one sample under `bound`);
 *  4. by the value on the basis ascending (typical for parts without one),
 *  5. ties by typical leakage, then by part index (the order of the records given, which
 *     the server keeps by part id).
 * This is the one place the rank order is decided; the server's API lists it as is.
 */
export { CatalogueTable } from './catalogue-table';
export { orderByKey } from './rank-order';
export {
	FLAG_CODES,
	FLAG_WORDS,
	explainFlag,
	flagsFromBits,
	POOR_FIT_RMS_V,
	TEMPERATURE_EXTRAPOLATION_K,
	type FlagCode
} from './rank-flags';
export {
	DEFAULT_BASIS,
	DEFAULT_CONFIDENCE,
	DEFAULT_COVERAGE,
	judgementOf,
	RANK_BASES,
	temperatureEnds,
	TOLERANCE_LIMITS,
	type Judgement,
	type OperatingPoint,
	type RankBasis
} from './operating-point';
export { logNormalUpperBound, noncentralTCdf, noncentralTQuantile, toleranceFactor } from './tolerance';
export type { BoundTerms, CatalogueView, Evidence, PartRecord, RankedPart, RankOptions, RankResult } from './rank-types';
export type { JunctionKind } from './names';
