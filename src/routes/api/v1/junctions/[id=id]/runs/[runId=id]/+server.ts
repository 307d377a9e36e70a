import { endpoint, readJson } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runChanges from '$lib/server/run-changes';
import { runIds, runJson } from '$lib/server/run-api';
import { correctSchema } from '$lib/schemas/runs';

// One stored run with every fit version and its history.
export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const { partId, runId } = runIds(event);
	return runJson(event, await runChanges.runDetail(partId, runId));
});

// Corrects the run's sample or temperature: recorded as a change, with a new fit version.
export const PATCH = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const input = await readJson(event, correctSchema);
	const { partId, runId } = runIds(event);
	return runJson(event, await runChanges.correct(user, partId, runId, input));
});
