import { error, fail, type ActionFailure } from '@sveltejs/kit';

/**
 * The one error type of the server's domain modules, and the two ways the web layer turns it
 * into an answer: an API route's wrapper (`endpoint()` in api.ts) writes the JSON error shape;
 * a page load or form action calls `pageError` or `formFailure` below. Domain modules never
 * throw SvelteKit's errors themselves, so they can be called from a script, a route or a test.
 */

/** Error codes of the JSON API, also carried by page errors as App.Error.code. */
export type ErrorCode =
	| 'bad_request'
	| 'unauthenticated'
	| 'forbidden'
	| 'not_found'
	| 'method_not_allowed'
	| 'conflict'
	| 'too_large'
	| 'unprocessable'
	| 'unavailable'
	| 'internal';

export const STATUS_CODE: Record<number, ErrorCode> = {
	400: 'bad_request',
	401: 'unauthenticated',
	403: 'forbidden',
	404: 'not_found',
	405: 'method_not_allowed',
	409: 'conflict',
	413: 'too_large',
	422: 'unprocessable',
	500: 'internal',
	503: 'unavailable'
};

/** One problem in the input, placed by field path or by row and column of a file. */
export type Issue = { path?: string; row?: number; column?: string; message: string };

export type DomainStatus = 400 | 401 | 403 | 404 | 409 | 413 | 422 | 503;

/** A known failure: what went wrong in words, its HTTP status and, for input, where. */
export class DomainError extends Error {
	constructor(
		public status: DomainStatus,
		message: string,
		public issues?: Issue[]
	) {
		super(message);
	}
}

/**
 * Stops the request now with SvelteKit's error (the page's error screen, or the API's JSON
 * error through `endpoint()`). For guards and routes; domain modules throw DomainError.
 */
export function httpError(status: DomainStatus, message: string, issues?: Issue[]): never {
	error(status, { message, code: STATUS_CODE[status] ?? 'bad_request', ...(issues ? { issues } : {}) });
}

/** In a page load: a DomainError becomes the error page with its status; anything else goes on up. */
export function pageError(e: unknown): never {
	if (e instanceof DomainError) httpError(e.status, e.message, e.issues);
	throw e;
}

/** In a form action: a DomainError becomes the form's failure with its status; anything else goes on up. */
export function formFailure<T extends Record<string, unknown>>(e: unknown, data: (e: DomainError) => T): ActionFailure<T> {
	if (e instanceof DomainError) return fail(e.status, data(e));
	throw e;
}
