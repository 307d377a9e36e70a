/**
 * Above this many parts the ranking screen ranks on the server (POST /api/v1/rank) instead
 * of loading the model snapshot into the browser.
 *
 * Measured by tests/bench/snapshot.bench.ts (2-core shared Xeon, Node 20's V8, scale-seed
 * parts with one given model each, ≈ 454 bytes per part; a measured part adds 136 bytes per
 * further sample), snapshot size / decode and table build / one re-ranking of the best 100:
 *    10k parts   4.5 MB    80 ms   1.4 ms
 *    25k parts  11.3 MB   203 ms   1.5 ms
 *    50k parts  22.7 MB   385 ms   2.2 ms
 *   100k parts  45.3 MB   688 ms   6.9 ms
 *   200k parts  90.8 MB  2174 ms  24.4 ms
 * Re-ranking stays well inside a 16.7 ms frame up to 100k parts (200k no longer fits); what
 * stops paying first is the first load: beyond 50k parts the download passes ~25 MB (2 s on
 * a 100 Mbit/s link, before the decode), while the server answers a ranking with ~50 kB.
 */
export const SNAPSHOT_MAX_PARTS = 50_000;
