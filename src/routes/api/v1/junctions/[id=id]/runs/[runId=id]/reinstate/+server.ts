import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runChanges from '$lib/server/run-changes';
import { runIds, runJson } from '$lib/server/run-api';
import { reinstateSchema } from '$lib/schemas/runs';

// Puts a withdrawn run back into its part's model. 409 when it already counts.
export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const { reason } = await readJson(event, reinstateSchema);
	const { partId, runId } = runIds(event);
	return runJson(event, await runChanges.reinstate(user, partId, runId, reason));
});
