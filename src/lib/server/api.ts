import { isHttpError, json, type RequestEvent, type RequestHandler } from '@sveltejs/kit';
import { z, ZodError } from 'zod';
import { DomainError, STATUS_CODE, type Issue } from './errors';

/** The API's one error shape: { error: { code, message, issues? } }. */
export function apiError(status: number, message: string, issues?: Issue[]) {
	return json(
		{ error: { code: STATUS_CODE[status] ?? 'error', message, ...(issues?.length ? { issues } : {}) } },
		// An outage is short: scripts that honour Retry-After wait a few seconds and try again.
		{ status, headers: status === 503 ? { 'retry-after': '5' } : {} }
	);
}

export function zodIssues(e: ZodError): Issue[] {
	return e.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

/** The first problem in words (its message names the field), and how many more there are. */
function plainMessage(e: ZodError): string {
	const [first, ...rest] = e.issues;
	if (!first) return 'The request does not match the expected shape.';
	const text = first.message.replace(/\.?$/, '.');
	return rest.length ? `${text} (${rest.length} more problem${rest.length === 1 ? '' : 's'} listed in issues.)` : text;
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
			if (e instanceof ZodError) return apiError(400, plainMessage(e), zodIssues(e));
			if (e instanceof DomainError) return apiError(e.status, e.message, e.issues);
			if (isDatabaseDown(e)) return apiError(503, DATABASE_UNAVAILABLE);
			throw e;
		}
	};
}

/** The one plain answer, page or API, while PostgreSQL cannot be reached. */
export const DATABASE_UNAVAILABLE =
	'The catalogue database is unavailable for a moment; nothing you saved is lost. Try again shortly.';

// Socket-level failures (refused, reset, unreachable, name lookup) and the driver's own
// connection errors (postgres.js: closed, ended, destroyed, connect timeout).
const DOWN_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'ECONNABORTED',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'ENOTFOUND',
	'EAI_AGAIN',
	'CONNECTION_CLOSED',
	'CONNECTION_ENDED',
	'CONNECTION_DESTROYED',
	'CONNECT_TIMEOUT'
]);

/**
 * SQLSTATEs of a server that is going away or not there yet (PostgreSQL manual, Appendix A
 * "Error codes"): class 08 connection exception, 53300 too_many_connections, 57P01
 * admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now, 57P05 idle session timeout.
 */
function isDownState(code: string): boolean {
	return code.startsWith('08') || code === '53300' || code === '57P01' || code === '57P02' || code === '57P03' || code === '57P05';
}

/** True when the failure is PostgreSQL being unreachable, however the driver wrapped it. */
export function isDatabaseDown(e: unknown, depth = 0): boolean {
	if (!e || typeof e !== 'object' || depth > 6) return false;
	const err = e as { code?: unknown; cause?: unknown; errors?: unknown };
	if (typeof err.code === 'string' && (DOWN_CODES.has(err.code) || (/^[0-9A-Z]{5}$/.test(err.code) && isDownState(err.code)))) return true;
	// Drizzle wraps driver errors (cause); Node reports several failed addresses at once (errors).
	if (isDatabaseDown(err.cause, depth + 1)) return true;
	return Array.isArray(err.errors) && err.errors.some((x) => isDatabaseDown(x, depth + 1));
}

/** Reads the query string with a schema (each parameter once, as text); a mismatch is a 400 naming the parameter. */
export function readQuery<T extends z.ZodType>(url: URL, schema: T): z.infer<T> {
	return schema.parse(Object.fromEntries(url.searchParams));
}

/** JSON request bodies are small; sweeps travel as files with their own, larger limit. */
const MAX_JSON_BYTES = 2 * 1024 * 1024;

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
