import { isHttpError, json, type RequestEvent, type RequestHandler } from '@sveltejs/kit';
import { z, ZodError } from 'zod';
import { STATUS_CODE, type Issue } from './http-error';

/** The API's one error shape: { error: { code, message, issues? } }. */
export function apiError(status: number, message: string, issues?: Issue[]) {
	return json(
		{ error: { code: STATUS_CODE[status] ?? 'error', message, ...(issues?.length ? { issues } : {}) } },
		{ status }
	);
}

export function zodIssues(e: ZodError): Issue[] {
	return e.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

/** Known failures a domain module throws; the wrapper turns them into JSON errors. */
export class DomainError extends Error {
	constructor(
		public status: 400 | 403 | 404 | 409 | 413 | 422 | 503,
		message: string,
		public issues?: Issue[]
	) {
		super(message);
	}
}

/**
 * Wraps a +server.ts handler: every failure leaves as the JSON error shape, never as an
 * HTML page or a stack trace.
 */
export function endpoint(handler: (event: RequestEvent) => Promise<Response> | Response): RequestHandler {
	return async (event) => {
		try {
			return await handler(event);
		} catch (e) {
			if (isHttpError(e)) return apiError(e.status, e.body.message, e.body.issues);
			if (e instanceof ZodError) return apiError(400, 'The request does not match the expected shape.', zodIssues(e));
			if (e instanceof DomainError) return apiError(e.status, e.message, e.issues);
			if (isDatabaseDown(e)) return apiError(503, 'The database is unavailable; try again shortly.');
			throw e;
		}
	};
}

// Connection refused or lost, server shutting down or starting up.
const DOWN_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'EPIPE', 'CONNECTION_CLOSED', 'CONNECTION_ENDED', 'CONNECTION_DESTROYED', 'CONNECT_TIMEOUT', '57P01', '57P02', '57P03']);

export function isDatabaseDown(e: unknown): boolean {
	// Drizzle wraps driver errors: look at the cause too.
	for (let err = e as { code?: string; cause?: unknown } | undefined, depth = 0; err && depth < 4; err = err.cause as typeof err, depth++) {
		const code = err.code;
		if (code && DOWN_CODES.has(code)) return true;
	}
	return false;
}

/** JSON request bodies are small; sweeps travel as files with their own, larger limit. */
export const MAX_JSON_BYTES = 2 * 1024 * 1024;

function tooLargeJson(size: number): never {
	throw new DomainError(413, `The body is ${size} bytes; JSON requests up to ${MAX_JSON_BYTES} bytes are accepted.`);
}

/** Reads a JSON body and validates it; malformed JSON is a 400 and an oversized one a 413. */
export async function readJson<T extends z.ZodType>(event: RequestEvent, schema: T): Promise<z.infer<T>> {
	const declared = Number(event.request.headers.get('content-length') ?? NaN);
	if (Number.isFinite(declared) && declared > MAX_JSON_BYTES) tooLargeJson(declared);
	let text: string;
	try {
		text = await event.request.text();
	} catch {
		throw new DomainError(400, 'The request body could not be read.');
	}
	if (text.length > MAX_JSON_BYTES) tooLargeJson(text.length);
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		throw new DomainError(400, 'The body is not valid JSON.');
	}
	return schema.parse(body);
}
