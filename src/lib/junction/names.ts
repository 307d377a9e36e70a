/**
 * The catalogue's words for junction kinds and materials, shared by the engine, the
 * database schema checks and browser code (no imports, so it is cheap to pull in anywhere).
 */

/** Kinds of junction, as the database and API spell them. */
export const JUNCTION_KINDS = ['diode', 'schottky', 'bjt-be', 'bjt-diode', 'jfet-gate', 'led'] as const;
export type JunctionKind = (typeof JUNCTION_KINDS)[number];

/** Junction materials, as the database and API spell them; the engine's defaults are keyed by these. */
export const MATERIALS = ['silicon', 'metal-semiconductor', 'germanium', 'wide-gap'] as const;
export type Material = (typeof MATERIALS)[number];
