// After sign-in a person goes back where they were — but only to a path on this site.
// Every place that reads a return address is tried with the addresses an attacker would
// send: the sign-in page's `next` when already signed in (cookie or Bearer token), the
// sign-in form's hidden `next`, and the callbackUrl inside the mailed link.
import { describe, expect, test } from 'vitest';
import * as people from '$lib/server/people';
import { APP_URL, cookieFor, mailbox, tokenFor, unique } from './helpers';

// How browsers resolve a Location header (WHATWG URL Standard: "\" is "/" in http(s), tabs
// and newlines are dropped): Node's URL implements the same parser.
const HOSTILE = ['//evil.example', '/\\evil.example', '/%5Cevil.example', 'https://evil.example/phish', 'javascript:alert(1)', '/%2F%2Fevil.example'];
const ORIGIN = new URL(APP_URL).origin;

function destination(location: string | null): URL {
	expect(location, 'a redirect').toBeTruthy();
	return new URL(location!, APP_URL);
}

describe('the sign-in page when already signed in', () => {
	for (const next of HOSTILE) {
		for (const via of ['cookie', 'Bearer token'] as const) {
			test(`next=${next} with a ${via} stays on the site`, async () => {
				const headers: Record<string, string> =
					via === 'cookie' ? { cookie: await cookieFor('designer') } : { authorization: `Bearer ${await tokenFor('designer')}` };
				const res = await fetch(`${APP_URL}/signin?next=${encodeURIComponent(next)}`, { headers, redirect: 'manual' });
				expect(res.status).toBe(303);
				const to = destination(res.headers.get('location'));
				expect(to.origin).toBe(ORIGIN);
				expect(to.pathname).toBe('/');
			});
		}
	}

	test('a path on the site is kept, query and all', async () => {
		const res = await fetch(`${APP_URL}/signin?next=${encodeURIComponent('/rank?biasV=-5')}`, {
			headers: { cookie: await cookieFor('designer') },
			redirect: 'manual'
		});
		expect(res.headers.get('location')).toBe('/rank?biasV=-5');
	});
});

async function requestLink(email: string, next: string) {
	const res = await fetch(`${APP_URL}/signin`, {
		method: 'POST',
		headers: { accept: 'text/html', origin: APP_URL, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, next }),
		redirect: 'manual'
	});
	expect(res.status).toBe(303);
	const mail = await mailbox.waitFor(email, /sign-in link/i);
	return mail.links.find((l) => l.includes('/auth/callback/'))!;
}

describe('the mailed sign-in link', () => {
	test('a hostile next in the sign-in form becomes the start page in the link and after it', async () => {
		for (const next of HOSTILE) {
			const person = await people.upsert({ email: `${unique('ret')}@demo.test`, name: 'Return Test', roles: ['designer'] }, null);
			const link = await requestLink(person.email, next);
			expect(new URL(new URL(link).searchParams.get('callbackUrl')!).origin).toBe(ORIGIN);
			const opened = await fetch(link, { redirect: 'manual' });
			expect(opened.status).toBe(302);
			const to = destination(opened.headers.get('location'));
			expect(to.origin, next).toBe(ORIGIN);
			expect(to.pathname, next).toBe('/');
		}
	});

	test('a link whose callbackUrl was rewritten to another site still lands on this one', async () => {
		for (const next of HOSTILE) {
			const person = await people.upsert({ email: `${unique('cb')}@demo.test`, name: 'Callback Test', roles: ['designer'] }, null);
			const link = new URL(await requestLink(person.email, '/projects'));
			link.searchParams.set('callbackUrl', next);
			// The app first points the link at a safe callbackUrl, then Auth.js signs in.
			let opened = await fetch(link, { redirect: 'manual' });
			for (let hops = 0; hops < 3 && opened.status === 303; hops++) {
				const again = destination(opened.headers.get('location'));
				expect(again.origin).toBe(ORIGIN);
				opened = await fetch(again, { redirect: 'manual' });
			}
			expect(opened.status, next).toBe(302);
			const to = destination(opened.headers.get('location'));
			expect(to.origin, next).toBe(ORIGIN);
			expect(to.pathname, next).toBe('/');
		}
	});

	test('a path on the site survives the whole round trip', async () => {
		const person = await people.upsert({ email: `${unique('ok')}@demo.test`, name: 'Round Trip', roles: ['designer'] }, null);
		const opened = await fetch(await requestLink(person.email, '/projects?mine=1'), { redirect: 'manual' });
		expect(destination(opened.headers.get('location')).href).toBe(`${ORIGIN}/projects?mine=1`);
	});
});
