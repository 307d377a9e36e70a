/**
 * Coverage and confidence of the statistical leakage bound: the defaults and the range a
 * designer may set. Apart from tolerance.ts so that forms and schemas can read them without
 * loading the numerical code.
 */

/** Coverage and confidence a designer may set (both inclusive). */
export const TOLERANCE_LIMITS = { min: 0.5, max: 0.999 } as const;
/** Defaults: 95 % of parts covered, with 90 % confidence. */
export const DEFAULT_COVERAGE = 0.95;
export const DEFAULT_CONFIDENCE = 0.9;
