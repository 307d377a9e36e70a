/**
 * Request shapes of the ranking screen and API (volts, amperes, ohms, farads, °C),
 * shared by the page, the URL state module and the endpoints.
 */
import { z } from 'zod';
import { MATERIAL_DEFAULTS } from '$lib/junction/model';

/** Junction kinds as the catalogue stores them (mirrors the database's list). */
export const RANK_KINDS = ['diode', 'schottky', 'bjt-be', 'bjt-diode', 'jfet-gate', 'led'] as const;
export type RankKind = (typeof RANK_KINDS)[number];

export const KIND_LABEL: Record<RankKind, string> = {
	diode: 'PN diode',
	schottky: 'Schottky',
	'bjt-be': 'BJT base–emitter',
	'bjt-diode': 'diode-connected BJT',
	'jfet-gate': 'JFET gate',
	led: 'LED'
};

/** Lifecycles as the catalogue stores them. */
export const RANK_LIFECYCLES = ['in-use', 'not-for-new', 'retired'] as const;
export type RankLifecycle = (typeof RANK_LIFECYCLES)[number];
export const LIFECYCLE_LABEL: Record<RankLifecycle, string> = {
	'in-use': 'fine for new designs',
	'not-for-new': 'existing boards only',
	retired: 'retired'
};

export const MAX_RANK_LIMIT = 1000;
/** Absolute zero in °C; no temperature may be at or below it. */
const ABS_ZERO_C = -273.15;

const finite = (what: string) => z.number({ error: `${what} must be a number` }).refine(Number.isFinite, `${what} must be finite`);
const positive = (what: string) => finite(what).refine((v) => v > 0, `${what} must be greater than zero`);
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
		maxCapacitanceF: positive('maxCapacitanceF').optional()
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
		withModels: z.number().int().min(0).max(10).optional()
	})
	.passthrough()
	.transform((v, ctx) => {
		const { limit, withModels, ...rest } = v;
		const op = operatingPointSchema.safeParse(rest);
		if (!op.success) {
			for (const i of op.error.issues) ctx.addIssue({ ...i, code: 'custom', message: i.message, path: i.path });
			return z.NEVER;
		}
		return { op: op.data, limit: limit ?? 100, withModels: withModels ?? 0 };
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

/** Flag codes the ranking reports (the engine's plus the screen's own limits). */
export const RANK_FLAGS = [
	'current-extrapolated',
	'temperature-extrapolated',
	'over-reverse-rating',
	'reverse-not-measured',
	'metal-semiconductor',
	'light-sensitive',
	'poor-fit',
	'few-samples',
	'forward-drop-over-limit',
	'over-leakage-target',
	'over-capacitance-limit',
	'band-gap-assumed'
] as const;
export type RankFlag = (typeof RANK_FLAGS)[number];

/** Short and long plain-words text for each flag. */
export const FLAG_WORDS: Record<RankFlag, { short: string; long: string; caution: boolean }> = {
	'current-extrapolated': {
		short: 'below measured current',
		long: 'The predicted current is over a decade below the lowest current measured on this part: the model is extrapolated.',
		caution: true
	},
	'temperature-extrapolated': {
		short: 'outside measured temperatures',
		long: 'An end of the temperature range lies more than 25 K from every temperature this part was measured at.',
		caution: true
	},
	'over-reverse-rating': {
		short: 'reverse rating exceeded',
		long: 'The reverse bias (plus the margin you asked for) exceeds the rated reverse voltage.',
		caution: true
	},
	'reverse-not-measured': {
		short: 'leakage never measured',
		long: 'Reverse leakage was never measured; only the Shockley floor is known and real leakage is higher.',
		caution: true
	},
	'metal-semiconductor': {
		short: 'metal–semiconductor',
		long: 'Metal–semiconductor junction: the Shockley model is empirical here.',
		caution: false
	},
	'light-sensitive': {
		short: 'light makes current',
		long: 'Glass or clear package, or an LED: ambient light makes a photocurrent that can exceed the dark leakage. Shield it.',
		caution: true
	},
	'poor-fit': {
		short: 'poor fit',
		long: 'The model fits the measured sweeps poorly (RMS residual over 2 mV), so predictions are less certain.',
		caution: true
	},
	'few-samples': {
		short: 'under 3 samples',
		long: 'Fewer than three samples were measured, so the part-to-part spread is unknown.',
		caution: false
	},
	'forward-drop-over-limit': {
		short: 'drop over limit',
		long: 'The worst-case forward drop at the clamp current (the larger of the hot and cold ends) exceeds your limit.',
		caution: true
	},
	'over-leakage-target': {
		short: 'over leakage budget',
		long: 'The worst-case leakage exceeds the allowed leakage (or error voltage across the source resistance).',
		caution: true
	},
	'over-capacitance-limit': {
		short: 'capacitance over limit',
		long: 'The junction capacitance at the bias exceeds your limit.',
		caution: true
	},
	'band-gap-assumed': {
		short: 'band gap assumed',
		long: `Nobody gave or measured this part's band gap, so a typical ${MATERIAL_DEFAULTS['wide-gap'].EG} eV was assumed. Its leakage at temperatures away from the measured ones is uncertain: blue, green and white LEDs and SiC parts have larger band gaps.`,
		caution: true
	}
};

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
	samples: number;
	leakageA: { typical: number; worst: number };
	forwardDropV: { cold: number; hot: number; worst: number } | null;
	/** Rated reverse voltage minus the reverse bias [V] (null when unrated or forward-biased). */
	reverseMarginV: number | null;
	capacitanceF: number | null;
	/** Worst leakage × source resistance [V], when a source resistance is given. */
	errorVoltageV: number | null;
	flags: RankFlag[];
	/**
	 * Whether the part meets every limit the operating point states (forward drop, leakage
	 * budget, capacitance, reverse rating). Parts meeting them all are listed first.
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
};
