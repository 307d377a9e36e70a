import { error } from '@sveltejs/kit';

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

export type Issue = { path?: string; row?: number; column?: string; message: string };

/** Throws SvelteKit's error with our code and optional field issues. */
export function fail(status: keyof typeof STATUS_CODE & number, message: string, issues?: Issue[]): never {
	error(status, { message, code: STATUS_CODE[status] ?? 'bad_request', ...(issues ? { issues } : {}) });
}
