/**
 * browser-rerank-per-s: how many complete re-rankings per second the ranking screen shows
 * while the bias field keeps changing, with the whole catalogue (≥ 10k parts) behind it.
 * Each step types a new bias and presses Enter, then waits until the page reports the new
 * ranking drawn (data-updates); requests, JSON and rendering are all inside the measure.
 * Needs APP_URL and DATABASE_URL (the running app and its database).
 */
import { randomBytes } from 'node:crypto';
import { chromium } from '@playwright/test';
import { record } from './results';

const STEPS = Number(process.env.RERANK_STEPS ?? 60);

export async function runBrowserBenchmarks(): Promise<void> {
	const appUrl = process.env.APP_URL;
	if (!appUrl) return console.log('browser-rerank-per-s skipped: APP_URL is not set');
	const people = await import('../../src/lib/server/people');
	const { db } = await import('../../src/lib/server/db');
	const { sessions } = await import('../../src/lib/server/db/schema');
	const designer = await people.findByEmail('designer@demo.test');
	if (!designer) throw new Error('demo designer missing');
	const sessionToken = randomBytes(24).toString('hex');
	await db.insert(sessions).values({ sessionToken, userId: designer.id, expires: new Date(Date.now() + 3600_000) });

	const browser = await chromium.launch({
		executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
		args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run']
	});
	try {
		const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
		await context.addCookies([{ name: 'authjs.session-token', value: sessionToken, url: appUrl }]);
		const page = await context.newPage();
		await page.goto(`${appUrl}/rank?v=-5&tlo=0&thi=85`);
		await page.locator('[data-live="yes"]').waitFor();
		const root = page.locator('[data-updates]');
		// Found once: a label lookup on every keystroke scans the whole page and would time
		// the test harness rather than the screen.
		const bias = (await page.getByLabel('Bias across the junction (positive is forward)').elementHandle())!;
		const evaluated = await page.getByText(/parts evaluated/).first().innerText();

		const step = async (k: number) => {
			const before = Number(await root.getAttribute('data-updates'));
			await bias.fill(`-${(1 + (k % 40) * 0.25).toFixed(2)} V`);
			await bias.press('Enter');
			await page.waitForFunction((n) => Number(document.querySelector('[data-updates]')?.getAttribute('data-updates')) > n, before);
		};
		for (let k = 0; k < 5; k++) await step(k); // warm-up
		const t0 = performance.now();
		for (let k = 0; k < STEPS; k++) await step(k + 5);
		const seconds = (performance.now() - t0) / 1000;
		const rate = STEPS / seconds;
		record('browser-rerank-per-s', rate, 30, `${STEPS} bias changes re-ranked and drawn in ${seconds.toFixed(2)} s in Debian chromium (${evaluated.replace(/\s+/g, ' ').slice(0, 60)})`);
		console.log(`browser-rerank-per-s: ${rate.toFixed(1)} (${STEPS} in ${seconds.toFixed(2)} s)`);
	} finally {
		await browser.close();
	}
}
