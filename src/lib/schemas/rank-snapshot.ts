/** GET /api/v1/rank/snapshot: `?since=<version>` or `?parts=<id,id,…>` (not both) ask for only some parts. */
import { z } from 'zod';
import { MAX_SNAPSHOT_PART_IDS } from '$lib/rank/rank-worker-protocol';

export const snapshotQuerySchema = z
	.object({
		since: z
			.string()
			.regex(/^[A-Za-z0-9_-]{1,64}$/, 'since must be a snapshot version as the server gave it (letters, digits, - and _)')
			.optional(),
		parts: z
			.string()
			.regex(/^\d{1,10}(,\d{1,10})*$/, 'parts must be part ids separated by commas, e.g. parts=12,40')
			.transform((s) => s.split(',').map(Number))
			.refine((ids) => ids.length <= MAX_SNAPSHOT_PART_IDS, `parts may name at most ${MAX_SNAPSHOT_PART_IDS} ids`)
			.optional()
	})
	.strict()
	.refine((q) => !(q.since !== undefined && q.parts !== undefined), { message: 'Give since or parts, not both.', path: ['parts'] });
