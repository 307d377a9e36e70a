import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runChanges from '$lib/server/run-changes';
import { runIds, runJson } from '$lib/server/run-api';
import { refitSchema } from '$lib/schemas/runs';

// Fits the stored file again, leaving out `excludeV` ([lo, hi] V; absent or null: every
// point); a C–V run may also change `strayCapacitanceF`. A new fit version; the earlier ones
// are kept. 409 when the run is withdrawn.
export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const input = await readJson(event, refitSchema);
	const { partId, runId } = runIds(event);
	return runJson(event, await runChanges.refit(user, partId, runId, { excludeV: input.excludeV ?? null, reason: input.reason, strayCapacitanceF: input.strayCapacitanceF }));
});
