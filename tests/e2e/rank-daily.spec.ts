// The ranking screen as a designer reads it every day, on the demo catalogue: a dense list
// whose flags are compact marks with their words on hover, on focus and in the legend.
import { test, expect, sessionFor, screenshot } from './fixtures';
import type { Browser, Page } from '@playwright/test';

const DESIGNER = 'designer@demo.test';
const DEFAULT_POINT = 'v=-5&tlo=25&thi=85&ic=1m&vf=0.7';

async function designerPage(browser: Browser, width = 1280): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width, height: 900 } });
	await sessionFor(context, DESIGNER);
	const page = await context.newPage();
	page.on('pageerror', (e) => console.error('page error:', e.message));
	return page;
}

/** Opens /rank and waits until the page is live (hydrated), so typing is heard. */
async function openRank(page: Page, query: string) {
	await page.goto(`/rank?${query}`);
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 20_000 });
	await expect(page.locator('tbody tr').first()).toBeVisible();
}

async function sidewaysScroll(page: Page): Promise<number> {
	return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

test('a ranked row with up to three flags is at most 56 px tall at 1280 px; the best 25 fit in about two screens', async ({ browser }) => {
	const page = await designerPage(browser);
	await openRank(page, DEFAULT_POINT);
	const rows = await page.locator('tbody tr').evaluateAll((trs) =>
		trs.map((tr) => ({ part: tr.getAttribute('data-part'), height: tr.getBoundingClientRect().height, flags: tr.querySelectorAll('[data-flag]').length }))
	);
	expect(rows.length).toBe(25);
	const withFlags = rows.filter((r) => r.flags >= 1 && r.flags <= 3);
	expect(withFlags.length, 'the demo ranking has rows with one to three flags').toBeGreaterThan(5);
	for (const r of rows.filter((r) => r.flags <= 3)) expect(r.height, `row ${r.part} (${r.flags} flags)`).toBeLessThanOrEqual(56);
	const list = await page.locator('tbody').evaluate((b) => b.getBoundingClientRect().height);
	expect(list, 'the best 25 within two 900 px screens').toBeLessThanOrEqual(2 * 900);
	expect(await sidewaysScroll(page)).toBeLessThanOrEqual(1);
	await screenshot(page, 'rank-dense-1280');
});

test('a flag mark shows its words on hover and on keyboard focus, and the legend explains every mark shown', async ({ browser }) => {
	const page = await designerPage(browser);
	await openRank(page, DEFAULT_POINT);
	const mark = page.locator('tbody [data-flag="current-extrapolated"]').first();
	await expect(mark).toHaveText(/I↓/);
	const words = mark.getByRole('tooltip', { includeHidden: true });
	await expect(words).toBeHidden();
	await mark.hover();
	await expect(words).toBeVisible();
	await expect(words).toContainText('below measured current');
	await page.mouse.move(0, 0);
	await expect(words).toBeHidden();
	// From the keyboard: Tab onto the mark, its words show and the focus ring is drawn.
	await page.locator('tbody tr').first().getByRole('link').focus();
	let onMark = false;
	for (let i = 0; i < 10 && !onMark; i++) {
		await page.keyboard.press('Tab');
		onMark = await page.evaluate(() => document.activeElement?.getAttribute('data-flag') === 'current-extrapolated');
	}
	expect(onMark).toBe(true);
	await expect(words).toBeVisible();
	expect(await page.evaluate(() => getComputedStyle(document.activeElement!).outlineStyle)).not.toBe('none');
	// The mark is read out in words, not as its glyphs.
	await expect(page.locator('tbody tr').first().getByRole('list', { name: 'Flags' })).toContainText('below measured current');
	const legend = page.getByTestId('flag-legend');
	const shown = await page.locator('tbody [data-flag]').evaluateAll((ms) => [...new Set(ms.map((m) => m.getAttribute('data-flag')))]);
	expect(shown.length).toBeGreaterThan(2);
	await expect(legend.locator('dt')).toHaveCount(shown.length);
	await expect(legend).toContainText('I↓');
	await expect(legend).toContainText('over a decade below the lowest current measured');
	await screenshot(page, 'rank-flag-focus-1280');
});

test('the dense list at 390 px: the page does not scroll sideways', async ({ browser }) => {
	const page = await designerPage(browser, 390);
	await openRank(page, DEFAULT_POINT);
	expect(await sidewaysScroll(page)).toBeLessThanOrEqual(1);
	await screenshot(page, 'rank-dense-390');
});
