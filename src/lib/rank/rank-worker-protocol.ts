/** Messages between the ranking screen and its ranking worker (rank.worker.ts). */
import type { RankOperatingPoint, RankResponse } from '$lib/schemas/rank';

export type ToWorker =
	| { type: 'load' }
	/** Parts whose models changed (null: any or all): fetch only those and rebuild. */
	| { type: 'changed'; partIds: number[] | null }
	| { type: 'rank'; seq: number; op: RankOperatingPoint; limit: number; withModels: number };

export type FromWorker =
	| { type: 'loaded'; version: string; parts: number; bytes: number; ms: number }
	| { type: 'load-failed'; message: string }
	| { type: 'ranked'; seq: number; result: RankResponse; ms: number }
	| { type: 'rank-failed'; seq: number; message: string };

/** Where the worker fetches the snapshot (the page's origin). */
export const SNAPSHOT_PATH = '/api/v1/rank/snapshot';

/** At most this many ids in `?parts=` (beyond it, the whole snapshot is the cheaper answer). */
export const MAX_SNAPSHOT_PART_IDS = 2000;
