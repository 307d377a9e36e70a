import { redirect, type Handle, type HandleServerError, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { dev } from '$app/environment';
import { authHandle, SESSION_COOKIES } from '$lib/server/auth';
import { apiError, DATABASE_UNAVAILABLE, isDatabaseDown } from '$lib/server/api';
import { asJsonApiError } from '$lib/server/api-errors';
import { client } from '$lib/server/db';
import { printableUrl } from '$lib/server/db/locate';
import { applyMigrations } from '$lib/server/db/migrate';
import { isCrossSiteFormWrite } from '$lib/server/csrf';
import { returnPath } from '$lib/return-path';
import { DEMO_BAND, isDemo, startRefusal } from '$lib/server/deployment';
import { startOutboxWorker, stopOutboxWorker } from '$lib/server/mail';
import { closeModelCache } from '$lib/server/model-cache';
import { startPruning, stopPruning } from '$lib/server/prune';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { tokenCache } from '$lib/server/token-cache';

/** Stops the process with a message an operator can act on (no stack trace). */
function refuseToStart(message: string): never {
	console.error(`\n${message}\n`);
	process.exit(1);
}

export const init: ServerInit = async () => {
	// The development server listens where vite.config.ts says (loopback).
	if (!dev) {
		const refusal = startRefusal();
		if (refusal) refuseToStart(refusal);
	}
	if (process.env.DATABASE_URL && process.env.MIGRATE_ON_START !== '0') {
		try {
			// Also fills in what a migration's new column or table needs from the app's own code.
			await applyMigrations(process.env.DATABASE_URL);
		} catch (e) {
			const reason = e instanceof Error ? e.message : String(e);
			refuseToStart(`Junctionary could not apply its database migrations to ${printableUrl(process.env.DATABASE_URL)}: ${reason}`);
		}
	}
	if (process.env.OUTBOX_WORKER !== '0') startOutboxWorker(Number(process.env.OUTBOX_EVERY_MS ?? 2000));
	startPruning();
	// node build keeps running while the pool is open: close it on shutdown.
	process.on('sveltekit:shutdown', async () => {
		stopOutboxWorker();
		stopPruning();
		await closeModelCache();
		await tokenCache.close();
		await client.end({ timeout: 5 });
	});
};

/** Pages anyone may open; everything else needs sign-in. */
function isPublic(path: string): boolean {
	return (
		path === '/signin' ||
		path.startsWith('/signin/') ||
		path.startsWith('/auth/') ||
		path === '/api/v1/health' ||
		(isDemo() && path.startsWith('/dev/mailbox'))
	);
}

/** Session cookie or bearer token → locals.user (with roles), once per request. */
const identify: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.via = null;
	const bearer = event.request.headers.get('authorization')?.match(/^Bearer\s+(\S+)$/i)?.[1];
	try {
		if (bearer) {
			event.locals.user = await tokens.resolve(bearer);
			event.locals.via = event.locals.user ? 'token' : null;
		} else {
			const cookie = SESSION_COOKIES.map((n) => event.cookies.get(n)).find(Boolean);
			if (cookie) {
				event.locals.user = await people.findBySessionToken(cookie);
				event.locals.via = event.locals.user ? 'session' : null;
			}
		}
	} catch (e) {
		if (isDatabaseDown(e) && !isPublic(event.url.pathname)) return unavailable(event.url.pathname);
		if (!isDatabaseDown(e)) throw e;
	}
	return resolve(event);
};

/** 503 while PostgreSQL is down: JSON for the API, a plain page for people. */
function unavailable(path: string): Response {
	if (path.startsWith('/api/')) return apiError(503, DATABASE_UNAVAILABLE);
	return new Response(
		`<!doctype html><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>Unavailable · Junctionary</title><body style="font-family:sans-serif;background:#f7f2e7;color:#2a2926;padding:3rem">${isDemo() ? `<p style="background:#2a2926;color:#f7f2e7;padding:.3rem .6rem;display:inline-block">${DEMO_BAND}</p>` : ''}<h1>Junctionary is catching its breath</h1><p>${DATABASE_UNAVAILABLE}</p><p><a href="">Reload</a></p>`,
		{ status: 503, headers: { 'content-type': 'text/html; charset=utf-8', 'retry-after': '5' } }
	);
}

/** The first gate: anonymous callers never reach a non-public route. Routes check roles. */
const gate: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	if (!event.locals.user && !isPublic(path)) {
		if (path.startsWith('/api/')) return apiError(401, 'Sign in or send an API token (Authorization: Bearer …).');
		if (path.startsWith('/dev/mailbox')) return apiError(404, 'Not found.');
		redirect(303, `/signin?next=${encodeURIComponent(path + event.url.search)}`);
	}
	return resolve(event);
};

/**
 * A callbackUrl on an Auth.js address (a sign-in link, say) is made a path on this site
 * before Auth.js reads it: Auth.js answers a malformed one with a server error, and its
 * redirect callback (auth.ts) only sees well-formed ones.
 */
const authReturnAddress: Handle = async ({ event, resolve }) => {
	const raw = event.url.searchParams.get('callbackUrl');
	if (raw !== null && event.url.pathname.startsWith('/auth/')) {
		const origin = event.url.origin;
		const safe = origin + returnPath(raw.startsWith(origin + '/') ? raw.slice(origin.length) : raw);
		if (safe !== raw && origin + raw !== safe) {
			const url = new URL(event.url);
			url.searchParams.set('callbackUrl', safe);
			redirect(303, url.pathname + url.search);
		}
	}
	return resolve(event);
};

const originCheck: Handle = async ({ event, resolve }) => {
	if (isCrossSiteFormWrite(event.request, event.url.origin)) {
		const message = `Cross-site ${event.request.method} form submissions are forbidden`;
		if (event.url.pathname.startsWith('/api/')) return apiError(403, message);
		return new Response(message, { status: 403, headers: { 'content-type': 'text/plain; charset=utf-8' } });
	}
	return resolve(event);
};

const securityHeaders: Handle = async ({ event, resolve }) => {
	let response = await resolve(event);
	// A page whose load lost the database mid-way is an outage, not a bug: say so with 503.
	if (response.status === 500 && event.locals.databaseDown) response = unavailable(event.url.pathname);
	// Redirects made with Response.redirect (Auth.js) have immutable headers: copy them.
	try {
		response.headers.set('x-content-type-options', 'nosniff');
	} catch {
		response = new Response(response.body, response);
		response.headers.set('x-content-type-options', 'nosniff');
	}
	response.headers.set('referrer-policy', 'same-origin');
	response.headers.set('x-frame-options', 'DENY');
	response.headers.set('permissions-policy', 'camera=(), microphone=(), geolocation=()');
	return response;
};

/** Unknown /api/ paths, wrong methods and unexpected errors answer JSON like every other API error. */
const apiErrors: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	if (!event.url.pathname.startsWith('/api/')) return response;
	return asJsonApiError(response, event.request.method, event.url.pathname);
};

/**
 * Auth.js answers its own addresses (sign-in links, sign-out); the app identifies people
 * itself (identify, below) and never asks Auth.js for the session, so other requests skip it.
 */
const authAddresses: Handle = (input) => (input.event.url.pathname.startsWith('/auth/') ? authHandle(input) : input.resolve(input.event));

export const handle = sequence(securityHeaders, apiErrors, originCheck, authReturnAddress, authAddresses, identify, gate);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (isDatabaseDown(error)) {
		event.locals.databaseDown = true;
		return { message: DATABASE_UNAVAILABLE, code: 'unavailable' };
	}
	if (status >= 500) console.error(event.url.pathname, error);
	return { message, code: status === 404 ? 'not_found' : 'internal' };
};
