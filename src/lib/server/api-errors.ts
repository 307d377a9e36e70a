// Every /api/ answer uses the API's JSON error shape, including the ones SvelteKit makes
// itself: its HTML 404 page for a path no route matches, its plain-text 405 for a method a
// route does not export, and its own JSON for an error nobody expected.
import { apiError } from './api';

/** The message of an error body in SvelteKit's own JSON ({ message }), if it is one. */
function ownMessage(body: unknown): string | null {
	if (body && typeof body === 'object' && 'message' in body && typeof body.message === 'string') return body.message;
	return null;
}

function defaultMessage(status: number, method: string, path: string, allow: string | null): string {
	if (status === 404) return `There is nothing at ${path} in the API; the paths are listed in DEVELOPERS.md.`;
	if (status === 405) return `${path} does not take ${method}${allow ? `; it takes ${allow}` : ''}.`;
	if (status >= 500) return 'Something went wrong on the server; nothing was changed by this request.';
	return 'The request was refused.';
}

/**
 * The response as it is when it already is a success or the JSON error shape; otherwise
 * the same status (and Allow / Retry-After headers) with `{ error: { code, message } }`.
 */
export async function asJsonApiError(response: Response, method: string, path: string): Promise<Response> {
	if (response.status < 400) return response;
	const type = response.headers.get('content-type') ?? '';
	let message: string | null = null;
	if (type.includes('application/json')) {
		let body: unknown = null;
		try {
			body = JSON.parse(await response.clone().text());
		} catch {
			/* not JSON after all */
		}
		const error = (body as { error?: { code?: unknown; message?: unknown } } | null)?.error;
		if (error && typeof error.code === 'string' && typeof error.message === 'string') return response;
		// SvelteKit's own body for a 404/405/500 carries no advice; below 500 it may be ours.
		message = response.status < 500 && response.status !== 404 && response.status !== 405 ? ownMessage(body) : null;
	}
	const allow = response.headers.get('allow');
	const out = apiError(response.status, message ?? defaultMessage(response.status, method, path, allow));
	for (const h of ['allow', 'retry-after']) {
		const v = response.headers.get(h);
		if (v) out.headers.set(h, v);
	}
	return out;
}
