// Shared helpers for integration tests: they talk HTTP to the running app (APP_URL) and
// read PostgreSQL (DATABASE_URL) directly to check what was, or was not, written.
import { randomBytes } from 'node:crypto';
import { db } from '$lib/server/db';
import { sessions } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import type { Role } from '$lib/permissions';

export const APP_URL = process.env.APP_URL ?? 'http://127.0.0.1:3100';
export const CATCHER_URL = process.env.MAIL_CATCHER_URL ?? 'http://127.0.0.1:2536';

export type Caller = Role | 'anonymous' | 'no-role';

/** The demo person holding exactly that role (seeded by npm test), or a role-less one. */
export async function personFor(who: Exclude<Caller, 'anonymous'>): Promise<people.Person> {
	const email = who === 'no-role' ? 'norole@demo.test' : `${who}@demo.test`;
	const found = await people.findByEmail(email);
	if (found) return found;
	if (who !== 'no-role') throw new Error(`demo person ${email} missing: was the seed loaded?`);
	return people.upsert({ email, name: 'Nobody Yet', roles: [] }, null);
}

const tokenCache = new Map<string, string>();

/** A bearer token for that caller, created once per test file. */
export async function tokenFor(who: Exclude<Caller, 'anonymous'>): Promise<string> {
	const cached = tokenCache.get(who);
	if (cached) return cached;
	const person = await personFor(who);
	const { token } = await tokens.create(person.id, `test ${who}`, null);
	tokenCache.set(who, token);
	return token;
}

/** A browser session cookie for that caller, as Auth.js would have set after sign-in. */
export async function cookieFor(who: Exclude<Caller, 'anonymous'>): Promise<string> {
	const person = await personFor(who);
	const sessionToken = randomBytes(24).toString('hex');
	await db.insert(sessions).values({ sessionToken, userId: person.id, expires: new Date(Date.now() + 3600_000) });
	return `authjs.session-token=${sessionToken}`;
}

export type ApiResult<T = any> = { status: number; body: T; headers: Headers };

/** Calls the JSON API as a caller (bearer token), with a JSON or raw body. */
export async function api<T = any>(
	method: string,
	path: string,
	opts: { as?: Caller; json?: unknown; body?: BodyInit; headers?: Record<string, string> } = {}
): Promise<ApiResult<T>> {
	const headers: Record<string, string> = { ...opts.headers };
	if (opts.as && opts.as !== 'anonymous') headers.authorization = `Bearer ${await tokenFor(opts.as)}`;
	let body = opts.body;
	if (opts.json !== undefined) {
		headers['content-type'] = 'application/json';
		body = JSON.stringify(opts.json);
	}
	const res = await fetch(APP_URL + path, { method, headers, body, redirect: 'manual' });
	// An event stream never ends by itself: its status and headers are the answer.
	if (res.headers.get('content-type')?.startsWith('text/event-stream')) {
		await res.body?.cancel();
		return { status: res.status, body: null as T, headers: res.headers };
	}
	const text = await res.text();
	let parsed: unknown = text;
	try {
		parsed = text ? JSON.parse(text) : null;
	} catch {
		/* not JSON: keep the text */
	}
	return { status: res.status, body: parsed as T, headers: res.headers };
}

/** Opens a page (or posts a form) as a caller with a session cookie; redirects are not followed. */
export async function browse(
	path: string,
	opts: { as?: Caller; form?: Record<string, string>; origin?: string } = {}
): Promise<{ status: number; location: string | null; text: string }> {
	const headers: Record<string, string> = { accept: 'text/html', origin: opts.origin ?? APP_URL };
	if (opts.as && opts.as !== 'anonymous') headers.cookie = await cookieFor(opts.as);
	let body: URLSearchParams | undefined;
	if (opts.form) {
		body = new URLSearchParams(opts.form);
		headers['content-type'] = 'application/x-www-form-urlencoded';
	}
	const res = await fetch(APP_URL + path, { method: body ? 'POST' : 'GET', headers, body, redirect: 'manual' });
	return { status: res.status, location: res.headers.get('location'), text: await res.text() };
}

export type CaughtMail = { id: number; to: string[]; subject: string; text: string; html: string; links: string[] };

export const mailbox = {
	async list(to?: string): Promise<CaughtMail[]> {
		const res = await fetch(`${CATCHER_URL}/messages${to ? `?to=${encodeURIComponent(to)}` : ''}`);
		return (await res.json()) as CaughtMail[];
	},
	/** Waits (up to `ms`) for a message to that address matching the subject. */
	async waitFor(to: string, subject: RegExp, ms = 15_000): Promise<CaughtMail> {
		const until = Date.now() + ms;
		while (Date.now() < until) {
			const found = (await this.list(to)).find((m) => subject.test(m.subject));
			if (found) return found;
			await new Promise((r) => setTimeout(r, 200));
		}
		throw new Error(`no mail to ${to} matching ${subject} within ${ms} ms`);
	}
};

/** A short unique suffix so tests never collide with each other or the demo data. */
export function unique(prefix = 't'): string {
	return `${prefix}-${Date.now().toString(36)}-${randomBytes(3).toString('hex')}`;
}
