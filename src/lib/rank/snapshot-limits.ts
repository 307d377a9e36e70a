/**
 * Above this many parts the ranking screen ranks on the server (POST /api/v1/rank) instead
 * of loading the model snapshot into the browser.
 *
 * Measured (tests/bench/snapshot-size.ts, 2-core shared Xeon, Node 20 / V8, scale-seed
 * parts, one sample each): PLACEHOLDER
 */
export const SNAPSHOT_MAX_PARTS = 50_000;
