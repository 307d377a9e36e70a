/**
 * What goes into the rank core (part records) and what comes out (columns, rows).
 * Definitions of the numbers are in rank.ts's header.
 */
import type { JunctionModel } from './model';
import type { JunctionKind } from './names';
import type { FlagCode } from './rank-flags';
import type { RankBasis } from './operating-point';
import type { ModelTable } from './model-table';

/** Where a part's model comes from: fitted to our bench sweeps, or given (card, datasheet) and never measured. */
export type Evidence = 'measured' | 'given';

/** A catalogue part as the server stores it. */
export interface PartRecord {
	id: string;
	kind: JunctionKind;
	/** One fitted model per measured sample (for a given part: the one given model). */
	samples: JunctionModel[];
	/** Each sample's unit label, in the order of `samples` (optional; reports only). */
	sampleUnits?: string[];
	/** Measured on the bench (default) or only given. A given part has no statistical bound. */
	evidence?: Evidence;
	ratings: { reverseV?: number; forwardCurrentA?: number };
	measured: {
		/** Smallest |current| ever measured on this part [A]. */
		minAbsCurrentA: number;
		/** Temperatures at which sweeps were measured [°C]. */
		temperaturesC: number[];
		/** Whether reverse-bias leakage was ever measured (otherwise only the IS floor is known). */
		reverseMeasured: boolean;
	};
	/** Clear or glass package: ambient light creates photocurrent. */
	transparentPackage?: boolean;
	/** Worst RMS fit residual among the samples [V]. */
	fitRmsResidualV?: number;
}

/** The statistical bound's terms for one part: n samples, factor k, coverage p, confidence γ. */
export interface BoundTerms {
	n: number;
	k: number;
	coverage: number;
	confidence: number;
}

export interface RankedPart {
	id: string;
	kind: JunctionKind;
	samples: number;
	evidence: Evidence;
	/** Leakage at the hot end [A]; `bound` is null for fewer than two measured samples. */
	leakageA: { typical: number; worst: number; bound: number | null };
	/** The bound's terms, null when there is no bound. */
	bound: BoundTerms | null;
	/** Each sample's |leakage| at the hot end [A], in record order (rows with `withSamples` only). */
	sampleLeakageA?: number[];
	forwardDropV?: { hot: number; cold: number; worst: number };
	capacitanceF?: number;
	/**
	 * Current-noise density at the bias and hot end [A/√Hz] (noise.ts): median sample, noisiest
	 * sample, and the statistical bound over the samples' noise powers (null as for leakage).
	 */
	noiseA_rtHz: { typical: number; worst: number; bound: number | null };
	flags: FlagCode[];
	/** The part meets every limit the operating point states (see rank.ts). */
	meetsLimits: boolean;
}

/** Options of `CatalogueTable.rank`. */
export interface RankOptions {
	/**
	 * Only the best `limit` parts are put in `order` (a partial selection, cheaper than
	 * ordering every part); the others are still evaluated and counted in `ranked`. A short
	 * list (at most a sixteenth of the parts) has columns filled in for its parts only.
	 */
	limit?: number;
	/**
	 * Mask by part index: only parts with a non-zero entry are ordered, counted or listed
	 * as excluded (e.g. the catalogue's kind and text filters). Length must be the table size.
	 */
	include?: Uint8Array;
	/**
	 * Write the result's per-part columns into buffers the table keeps instead of fresh
	 * arrays: no allocation proportional to the catalogue, but the result is only valid
	 * until the next `rank` call with `reuse` on this table (use it when the result is read
	 * at once, as the server does). Such a result is read-only: some of its columns are the
	 * table's kept ones (forward drops, the NaN of figures not computed).
	 */
	reuse?: boolean;
}

/** Columnar ranking result; `rows()` turns a page of it into objects. */
export interface RankResult {
	/** Part indices in rank order (rank.ts); excluded parts are left out. At most `limit` long. */
	order: Int32Array;
	/** How many parts the full order holds (≥ order.length when a limit cut it). */
	ranked: number;
	/** Of those, how many meet every limit (they come first in the order). */
	meetingLimits: number;
	/** Parts excluded by the reverse rating (among the included ones). */
	excluded: Int32Array;
	basis: RankBasis;
	coverage: number;
	confidence: number;
	/**
	 * Typical and worst leakage [A] and `flags` per part: of every part, except for a short
	 * list (a `limit` of at most a sixteenth of the parts, no noise limit), which fills them in
	 * for the parts in `order` only (rank-select.ts).
	 */
	typicalA: Float64Array;
	worstA: Float64Array;
	/**
	 * Statistical bound [A] of every part in `order`; NaN for parts with fewer than two
	 * measured samples, and for parts left out of `order` whose bound the ranking did not need.
	 */
	boundA: Float64Array;
	/** Tolerance factor by measured sample count (NaN below two). */
	factorByCount: Float64Array;
	/** Signed current of every sample model at the hot end, in table order [A]. */
	sampleA: Float64Array;
	/** Forward drops (NaN when no clamp current was asked for). */
	dropHotV: Float64Array;
	dropColdV: Float64Array;
	dropWorstV: Float64Array;
	flags: Uint32Array;
	/** Median capacitance at the bias [F], computed for every part only when a capacitance limit is given (else NaN). */
	capacitanceF: Float64Array;
	/** Current-noise density [A/√Hz] (typical, noisiest sample, bound), computed for every part only when a noise limit is given (else NaN). */
	noiseTypical: Float64Array;
	noiseWorst: Float64Array;
	noiseBound: Float64Array;
	hotC: number;
	coldC: number;
}

/**
 * A catalogue table's columns, read-only, for evaluations over the same catalogue that are
 * not a single-junction ranking (the protected node's): part p's sample models are
 * models[start[p] … start[p] + count[p] − 1].
 */
export interface CatalogueView {
	records: readonly PartRecord[];
	models: ModelTable;
	start: Int32Array;
	count: Int32Array;
	/** 1 for a part with only a given model. */
	given: Uint8Array;
	/** Flag bits that hold whatever the operating point (rank-flags.ts). */
	staticFlags: Uint32Array;
	minMeasuredA: Float64Array;
	/** Ratings (Infinity when unrated) [V], [A]. */
	ratedReverseV: Float64Array;
	ratedForwardA: Float64Array;
	/** 1 per part when a temperature [°C] lies more than the extrapolation distance from every measured one. */
	farAt(temperatureC: number): Uint8Array;
	/** Tolerance factor by sample count (NaN below two samples). */
	factorsFor(coverage: number, confidence: number): Float64Array;
}
