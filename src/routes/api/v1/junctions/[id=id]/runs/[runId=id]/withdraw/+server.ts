import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runChanges from '$lib/server/run-changes';
import { runIds, runJson } from '$lib/server/run-api';
import { withdrawSchema } from '$lib/schemas/runs';

// Takes the run out of its part's model; its file, fits and history stay. 409 when already withdrawn.
export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const { reason } = await readJson(event, withdrawSchema);
	const { partId, runId } = runIds(event);
	return runJson(event, await runChanges.withdraw(user, partId, runId, reason));
});
