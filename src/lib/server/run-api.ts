// The run endpoints' shared answer: the run as runDetail gives it, points only when asked.
import { json, type RequestEvent } from '@sveltejs/kit';
import type { RunDetail } from './run-changes';

/** Part and run ids from the route (the id matcher has already checked both). */
export function runIds(event: RequestEvent): { partId: number; runId: number } {
	return { partId: Number(event.params.id), runId: Number(event.params.runId) };
}

/** `?points=1` adds the parsed points, which can be long; otherwise only their count. */
export function runJson(event: RequestEvent, run: RunDetail & { modelVersion?: number | null }) {
	const { points, ...rest } = run;
	return json(event.url.searchParams.get('points') === '1' ? { ...rest, points } : rest);
}
