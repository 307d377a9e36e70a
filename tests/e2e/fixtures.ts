import { test as base, expect, type BrowserContext, type Page } from '@playwright/test';
import { mkdirSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import postgres from 'postgres';

export const CATCHER_URL = process.env.MAIL_CATCHER_URL ?? 'http://127.0.0.1:2536';
export const SCREENSHOTS = 'tests/e2e/screenshots';

type Mail = { id: number; to: string[]; subject: string; links: string[] };

async function newestMail(to: string, subject: RegExp, after: number): Promise<Mail> {
	const until = Date.now() + 15_000;
	while (Date.now() < until) {
		const res = await fetch(`${CATCHER_URL}/messages?to=${encodeURIComponent(to)}`);
		const list = (await res.json()) as Mail[];
		const found = list.find((m) => m.id > after && subject.test(m.subject));
		if (found) return found;
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`no mail for ${to} matching ${subject}`);
}

async function lastMailId(): Promise<number> {
	const list = (await (await fetch(`${CATCHER_URL}/messages`)).json()) as Mail[];
	return list[0]?.id ?? 0;
}

/**
 * Signs in the way a person does: asks for a link on the sign-in page, opens the local
 * mailbox page, and follows the link in the newest message. It waits for the page's scripts
 * before typing (a development server may still be hydrating) and tries once more if the
 * request was lost to a reload.
 */
export async function signInAs(page: Page, email: string, next = '/') {
	await expect(async () => {
		const before = await lastMailId();
		await page.goto(`/signin?next=${encodeURIComponent(next)}`);
		await page.waitForLoadState('networkidle');
		await page.getByLabel('Work e-mail').fill(email);
		await page.getByRole('button', { name: /sign-in link/i }).click();
		await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
		const mail = await newestMail(email, /sign-in link/i, before);
		await page.goto(`/dev/mailbox?to=${encodeURIComponent(email)}`);
		await page.locator(`a[href="${mail.links[0]}"]`).first().click();
		await page.waitForURL((u) => !u.pathname.startsWith('/auth') && !u.pathname.startsWith('/dev'));
	}).toPass({ timeout: 45_000 });
	await page.waitForLoadState('networkidle');
}

/** Waits until the page runs in the browser (the root layout marks <main> once it has). */
export async function whenReady(page: Page) {
	await expect(page.locator('main[data-ready="yes"]')).toBeVisible({ timeout: 20_000 });
}

/** Fails when the page scrolls sideways at the current width. */
export async function noSideScroll(page: Page) {
	const { over, culprits } = await page.evaluate(() => {
		const width = document.documentElement.clientWidth;
		// The first few elements reaching past the right edge, to name in the failure.
		const culprits = [...document.querySelectorAll('body *')]
			.filter((el) => el.getBoundingClientRect().right > width + 1 && !el.parentElement?.closest('.overflow-x-auto, .overflow-auto'))
			.slice(0, 3)
			.map((el) => `${el.tagName.toLowerCase()}.${String(el.className).slice(0, 60)}`);
		return { over: document.documentElement.scrollWidth - width, culprits };
	});
	expect(over, `the page scrolls sideways; too wide: ${culprits.join(' | ')}`).toBeLessThanOrEqual(0);
}

/** Screenshots at 1280 px and 390 px wide (each checked for sideways scrolling), then back to 1280 px. */
export async function screenshotWidths(page: Page, name: string) {
	for (const [width, height] of [
		[1280, 900],
		[390, 844]
	] as const) {
		await page.setViewportSize({ width, height });
		// Charts redraw to the new width on the next frames.
		await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(r, 250)))));
		await noSideScroll(page);
		await screenshot(page, `${name}-${width}`);
	}
	await page.setViewportSize({ width: 1280, height: 900 });
}

/** kT/q at 25 °C [V], from the exact SI 2019 values of k and q. */
const VT25 = 0.025693;

/**
 * A forward sweep V = N·Vt·ln(I/IS + 1) + I·RS at 25 °C, 1 nA to 1 mA in 31 points, with
 * 0.1 mV of ripple; a salt in the first value makes each file new to the catalogue. With
 * `ranges`, a third column names the meter range of each point.
 */
export function forwardSweep(IS: number, N: number, RS: number, opts: { ranges?: boolean } = {}): Buffer {
	const salt = Math.floor(Math.random() * 9e8) + 1e8; // nine digits, so two test files never meet by chance
	const rows = [opts.ranges ? 'V (V),I (A),Range' : 'V (V),I (A)'];
	for (let k = 0; k <= 30; k++) {
		const i = 1e-9 * 1e6 ** (k / 30);
		const v = N * VT25 * Math.log(i / IS + 1) + i * RS + 1e-4 * Math.sin(k * 7.1);
		const range = opts.ranges ? `,${i < 1e-8 ? '10nA' : i < 1e-6 ? '1uA' : '100uA'}` : '';
		rows.push(`${v.toPrecision(6)}${k === 0 ? salt : ''},${i.toPrecision(6)}${range}`);
	}
	return Buffer.from(rows.join('\n') + '\n');
}

/**
 * Two invented diodes with given models, added through the API by a page signed in as a
 * librarian: a quiet one (IS 2 fA, N 1.02) and a leaky one (IS 5 nA, N 1.9), by Quillmark Semi.
 */
export async function addQuietAndLeaky(page: Page, quiet: string, leaky: string) {
	for (const [partNumber, model] of [
		[quiet, { IS: 2e-15, N: 1.02, RS: 0.8 }],
		[leaky, { IS: 5e-9, N: 1.9, RS: 0.3 }]
	] as const) {
		const res = await page.request.post('/api/v1/junctions', { data: { partNumber, maker: 'Quillmark Semi', kind: 'diode', model } });
		expect(res.status(), await res.text()).toBe(201);
	}
}

export async function screenshot(page: Page, name: string) {
	mkdirSync(SCREENSHOTS, { recursive: true });
	await page.screenshot({ path: `${SCREENSHOTS}/${name}.png`, fullPage: true });
}

export const test = base;
export { expect };

/**
 * A signed-in browser context without going through the mailbox: a session row written as
 * Auth.js writes it after a sign-in, and its cookie. For specs about other screens, so the
 * per-address limit on sign-in links is left to the specs that test signing in.
 */
export async function sessionFor(context: BrowserContext, email: string): Promise<void> {
	const sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
	try {
		const token = randomBytes(24).toString('hex');
		const [user] = await sql`select id from users where email = ${email}`;
		if (!user) throw new Error(`no person ${email}: was the seed loaded?`);
		await sql`insert into sessions (session_token, user_id, expires) values (${token}, ${user.id}, ${new Date(Date.now() + 3600_000)})`;
		const url = new URL(test.info().project.use.baseURL ?? 'http://127.0.0.1:3100');
		await context.addCookies([{ name: 'authjs.session-token', value: token, domain: url.hostname, path: '/', httpOnly: true, sameSite: 'Lax' }]);
	} finally {
		await sql.end();
	}
}
