/**
 * Request shapes of the ranking screen and API (volts, amperes, ohms, farads, °C),
 * shared by the page, the URL state module and the endpoints.
 */
import { z } from 'zod';

// Kinds and lifecycles with their labels: the catalogue's vocabulary, one for every screen.
import { JUNCTION_KINDS, KIND_LABEL, LIFECYCLES, LIFECYCLE_LABEL, type JunctionKind, type Lifecycle } from '$lib/catalogue/vocabulary';
export const RANK_KINDS = JUNCTION_KINDS;
export const RANK_LIFECYCLES = LIFECYCLES;
export { KIND_LABEL, LIFECYCLE_LABEL };
export type RankKind = JunctionKind;
export type RankLifecycle = Lifecycle;

export const MAX_RANK_LIMIT = 1000;

// What leakage a ranking is judged on, and the statistical bound's coverage and confidence.
import { DEFAULT_BASIS, RANK_BASES, type RankBasis } from '$lib/junction/operating-point';
import { DEFAULT_CONFIDENCE, DEFAULT_COVERAGE, TOLERANCE_LIMITS } from '$lib/junction/tolerance-limits';
export { DEFAULT_BASIS, DEFAULT_CONFIDENCE, DEFAULT_COVERAGE, RANK_BASES, TOLERANCE_LIMITS, type RankBasis };
/** The bases in words, for headings and choosers. */
export const BASIS_LABEL: Record<RankBasis, string> = {
	bound: 'statistical bound',
	worst: 'worst measured sample',
	typical: 'typical (median) sample'
};
/** Absolute zero in °C; no temperature may be at or below it. */
const ABS_ZERO_C = -273.15;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);
const positive = (what: string) => finite(what).refine((v) => v > 0, `${what} must be greater than zero`);
/** A fraction the bound is stated at (coverage, confidence), 0.5…0.999 inclusive. */
const fraction = (what: string, example: string) =>
	z
		.number({ error: `${what} must be a number between ${TOLERANCE_LIMITS.min} and ${TOLERANCE_LIMITS.max}, ${example}` })
		.refine(
			(v) => Number.isFinite(v) && v >= TOLERANCE_LIMITS.min && v <= TOLERANCE_LIMITS.max,
			`${what} must lie between ${TOLERANCE_LIMITS.min} and ${TOLERANCE_LIMITS.max} (a fraction, ${example})`
		);
const celsius = (what: string) =>
	finite(what).refine((v) => v > ABS_ZERO_C && v < 1000, `${what} must lie between absolute zero and 1000 °C`);

/** The operating point, without paging. */
export const operatingPointSchema = z
	.object({
		/** Bias across the junction [V]; positive = forward, negative = reverse. */
		biasV: finite('biasV').refine((v) => Math.abs(v) <= 10_000, 'biasV must be within ±10 kV'),
		temperatureC: celsius('temperatureC').optional(),
		temperatureRangeC: z
			.tuple([celsius('temperatureRangeC[0]'), celsius('temperatureRangeC[1]')])
			.refine(([lo, hi]) => lo <= hi, 'temperatureRangeC must be [low, high] with low ≤ high')
			.optional(),
		clampCurrentA: positive('clampCurrentA').optional(),
		maxForwardDropV: positive('maxForwardDropV').optional(),
		kinds: z.array(z.enum(RANK_KINDS)).max(RANK_KINDS.length).optional(),
		q: z.string().trim().max(120).optional(),
		packages: z.array(z.string().trim().min(1).max(60)).max(50).optional(),
		lifecycles: z.array(z.enum(RANK_LIFECYCLES)).max(RANK_LIFECYCLES.length).optional(),
		/** Keep this far below the rated reverse voltage [V]. */
		reverseMarginV: finite('reverseMarginV').refine((v) => v >= 0, 'reverseMarginV must be zero or more').optional(),
		/** List parts biased beyond their rating (flagged) instead of leaving them out. */
		includeOverRating: z.boolean().optional(),
		/** Source resistance of the protected node [Ω]: error voltage = leakage × this. */
		sourceResistanceOhm: positive('sourceResistanceOhm').optional(),
		/** Allowed error voltage across the source resistance [V]. */
		allowedErrorV: positive('allowedErrorV').optional(),
		/** Allowed worst-case leakage [A]. */
		leakageTargetA: positive('leakageTargetA').optional(),
		/** Largest acceptable junction capacitance at the bias [F]. */
		maxCapacitanceF: positive('maxCapacitanceF').optional(),
		/** Largest acceptable current-noise density at the bias and hot end, on the basis [A/√Hz]. */
		maxNoiseA_rtHz: positive('maxNoiseA_rtHz').optional(),
		/** What the order and the leakage budget are judged on (default "bound"). */
		basis: z
			.enum(RANK_BASES, { error: 'basis must be "bound" (statistical bound), "worst" (worst measured sample) or "typical"' })
			.optional(),
		/** Fraction of parts the statistical bound covers (default 0.95). */
		coverage: fraction('coverage', 'e.g. 0.95 for 95 % of parts').optional(),
		/** Confidence of the statistical bound (default 0.90). */
		confidence: fraction('confidence', 'e.g. 0.9 for 90 % confidence').optional()
	})
	.strict()
	.superRefine((op, ctx) => {
		const hasT = op.temperatureC !== undefined;
		const hasR = op.temperatureRangeC !== undefined;
		if (hasT === hasR)
			ctx.addIssue({
				code: 'custom',
				path: ['temperatureC'],
				message: 'Give either temperatureC or temperatureRangeC: [low, high], not both and not neither.'
			});
		if (op.allowedErrorV !== undefined && op.sourceResistanceOhm === undefined)
			ctx.addIssue({
				code: 'custom',
				path: ['allowedErrorV'],
				message: 'An allowed error voltage needs sourceResistanceOhm to turn it into a leakage.'
			});
		if (op.allowedErrorV !== undefined && op.leakageTargetA !== undefined)
			ctx.addIssue({
				code: 'custom',
				path: ['leakageTargetA'],
				message: 'Give an allowed error voltage or an allowed leakage, not both.'
			});
	});
export type RankOperatingPoint = z.infer<typeof operatingPointSchema>;

/** POST /api/v1/rank. */
export const rankRequestSchema = z
	.object({
		limit: z.number().int().min(1).max(MAX_RANK_LIMIT, `limit must be at most ${MAX_RANK_LIMIT}`).optional(),
		/** Attach the typical model to the first this-many items (for curves drawn in the browser). */
		withModels: z.number().int().min(0).max(10).optional(),
		/** Add each sample's leakage at the hot end to every item (`sampleLeakage`). */
		withSamples: z.boolean({ error: 'withSamples must be true or false' }).optional()
	})
	.passthrough()
	.transform((v, ctx) => {
		const { limit, withModels, withSamples, ...rest } = v;
		const op = operatingPointSchema.safeParse(rest);
		if (!op.success) {
			for (const i of op.error.issues) ctx.addIssue({ ...i, code: 'custom', message: i.message, path: i.path });
			return z.NEVER;
		}
		return { op: op.data, limit: limit ?? 100, withModels: withModels ?? 0, withSamples: withSamples ?? false };
	});
export type RankRequest = z.output<typeof rankRequestSchema>;

/** A SPICE-named model (TNOM °C, default 27). */
export const spiceModelSchema = z
	.object({
		IS: positive('IS'),
		N: positive('N'),
		RS: finite('RS').refine((v) => v >= 0, 'RS must be zero or more').optional(),
		RSH: positive('RSH').optional(),
		ISR: finite('ISR').refine((v) => v >= 0, 'ISR must be zero or more').optional(),
		NR: positive('NR').optional(),
		BV: positive('BV').optional(),
		IBV: positive('IBV').optional(),
		EG: positive('EG').optional(),
		XTI: finite('XTI').optional(),
		TNOM: celsius('TNOM').optional(),
		CJO: finite('CJO').refine((v) => v >= 0, 'CJO must be zero or more').optional(),
		VJ: positive('VJ').optional(),
		M: finite('M').refine((v) => v >= 0 && v < 1, 'M must be in [0, 1)').optional(),
		FC: finite('FC').refine((v) => v >= 0 && v < 1, 'FC must be in [0, 1)').optional()
	})
	.strict();
export type SpiceModel = z.infer<typeof spiceModelSchema>;

/** POST /api/v1/predict. */
export const predictRequestSchema = z
	.object({
		model: spiceModelSchema,
		temperatureC: celsius('temperatureC'),
		biasV: z.array(finite('biasV[]').refine((v) => Math.abs(v) <= 10_000, 'each bias must be within ±10 kV')).max(2000).optional(),
		currentA: z.array(finite('currentA[]')).max(2000).optional()
	})
	.strict()
	.refine((r) => (r.biasV?.length ?? 0) + (r.currentA?.length ?? 0) > 0, {
		message: 'Give biasV (volts) and/or currentA (amperes) to predict at.',
		path: ['biasV']
	});
export type PredictRequest = z.infer<typeof predictRequestSchema>;

/** Flag codes the ranking reports, and their words: the engine's. */
export { FLAG_CODES as RANK_FLAGS, FLAG_WORDS } from '$lib/junction/rank-flags';
import type { FlagCode } from '$lib/junction/rank-flags';
export type RankFlag = FlagCode;

/** One ranked part as the API returns it. */
export type RankItem = {
	rank: number;
	id: number;
	partNumber: string;
	maker: string;
	kind: RankKind;
	package: string;
	lifecycle: RankLifecycle;
	ratedReverseV: number | null;
	/** Rated forward current [A], null when not rated (a clamp current above it is flagged). */
	ratedForwardA: number | null;
	/** Sample models behind the numbers (1 for a part with only a given model). */
	samples: number;
	/** Measured on our bench, or only a given model (card, datasheet): given parts rank after measured ones. */
	evidence: 'measured' | 'given';
	/**
	 * Leakage at the hot end [A]: typical = median sample, worst = the sample leaking most at
	 * the operating point, bound = the statistical bound (null with fewer than two measured samples).
	 */
	leakageA: { typical: number; worst: number; bound: number | null };
	/** The bound's terms: n samples, tolerance factor k, coverage and confidence; null when there is no bound. */
	bound: { n: number; k: number; coverage: number; confidence: number } | null;
	/** Each sample's |leakage| at the hot end, with `withSamples` only. */
	sampleLeakage?: { unit: string; leakageA: number }[];
	forwardDropV: { cold: number; hot: number; worst: number } | null;
	/** Rated reverse voltage minus the reverse bias [V] (null when unrated or forward-biased). */
	reverseMarginV: number | null;
	capacitanceF: number | null;
	/**
	 * Current-noise density at the bias and hot end [A/√Hz]: shot noise 2q·(I + 2·IS) of the
	 * ideal junction plus the shunt's 4kT/RSH; typical, noisiest sample and bound as for leakage.
	 */
	noiseA_rtHz: { typical: number; worst: number; bound: number | null };
	/** Worst leakage × source resistance [V], when a source resistance is given. */
	errorVoltageV: number | null;
	flags: RankFlag[];
	/**
	 * Whether the part meets every limit the operating point states (forward drop, leakage
	 * budget, capacitance, current noise, reverse rating). Parts meeting them all are listed first.
	 */
	meetsLimits: boolean;
	/** Typical model (SPICE names), for the first `withModels` items only. */
	model?: SpiceModel & { material?: string };
};

export type RankResponse = {
	items: RankItem[];
	/** Parts evaluated (matching the filters). */
	evaluated: number;
	/** Of those, left out for exceeding the reverse rating. */
	excludedOverRating: number;
	/** Temperatures used: worst leakage at hot, worst drop at cold. */
	hotC: number;
	coldC: number;
	/** The leakage budget used for the over-leakage flag, if any [A]. */
	leakageBudgetA: number | null;
	/** What the order and the budget were judged on, and the bound's coverage and confidence. */
	basis: RankBasis;
	coverage: number;
	confidence: number;
};
