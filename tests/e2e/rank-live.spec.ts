// The ranking screen ranking in the browser: once its worker holds the model snapshot, the
// sliders beside the bias and the hot end write into the typed fields (arrow keys step a
// decade-aware amount), the list follows with the numbers POST /api/v1/rank gives for the
// same fields, the address stays bookmarkable, and a part a librarian stores appears by
// itself. Without JavaScript the same address still ranks on the server.
import { test, expect, sessionFor, addQuietAndLeaky } from './fixtures';

const stamp = Date.now().toString(36);

async function designerPage(browser: import('@playwright/test').Browser, javaScriptEnabled = true) {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, javaScriptEnabled });
	await sessionFor(context, 'designer@demo.test');
	const page = await context.newPage();
	page.on('pageerror', (e) => console.error('page error:', e.message));
	return page;
}

/** Part numbers of the drawn rows, in order. */
const rows = (page: import('@playwright/test').Page) => page.locator('tbody tr').evaluateAll((r) => r.map((x) => x.getAttribute('data-part')));

test('the sliders write the typed fields, arrow keys step by decades, and the list is the server\'s ranking', async ({ browser }) => {
	const page = await designerPage(browser);
	await page.goto('/rank?v=-5&tlo=0&thi=85');
	await expect(page.locator('[data-ranks-in="browser"]')).toBeAttached({ timeout: 20_000 });
	const bias = page.getByLabel('Bias across the junction (positive is forward)');
	const slider = page.getByLabel('Slide the bias');
	await expect(slider).toHaveAttribute('aria-valuetext', '−5.000 V');

	const updates = async () => Number(await page.locator('[data-updates]').getAttribute('data-updates'));
	const before = await updates();
	await slider.focus();
	await page.keyboard.press('ArrowDown');
	await expect(bias).toHaveValue('−5.100 V');
	await page.keyboard.press('ArrowUp');
	await page.keyboard.press('ArrowUp');
	await expect(bias).toHaveValue('−4.900 V');
	await expect.poll(updates).toBeGreaterThan(before);
	// Bookmarkable: the address carries the typed value.
	await expect.poll(() => new URL(page.url()).searchParams.get('v')).toBe('-4.9');

	// The hot end's slider, Page Up: ten kelvin.
	const hot = page.getByLabel('Slide the hot end');
	await hot.focus();
	await page.keyboard.press('PageUp');
	await expect(page.getByLabel('Highest temperature')).toHaveValue('90 °C');

	// The list drawn is the server's ranking of the same fields.
	await expect.poll(() => new URL(page.url()).searchParams.get('thi')).toBe('90');
	const api = await page.request.post('/api/v1/rank', { data: { biasV: -4.9, temperatureRangeC: [0, 90], limit: 25 } });
	const expected = ((await api.json()).items as { partNumber: string }[]).map((i) => i.partNumber);
	await expect.poll(() => rows(page)).toEqual(expected);
	// The curves are drawn for the same ranking once they are in view (off screen they wait).
	await page.locator('[data-revision]').scrollIntoViewIfNeeded();
	await expect(page.locator('[data-revision]')).toHaveAttribute('data-revision', String(await updates()));
});

test('a part a librarian stores appears on an open ranking without a reload', async ({ browser }) => {
	const page = await designerPage(browser);
	const quiet = `LIVEQ-${stamp}`;
	const leaky = `LIVEL-${stamp}`;
	await page.goto(`/rank?v=-5&thi=85&q=${stamp}`);
	await expect(page.locator('[data-ranks-in="browser"]')).toBeAttached({ timeout: 20_000 });
	await expect(page.getByText('No part matches these conditions.')).toBeVisible();

	const librarianContext = await browser.newContext({ baseURL: test.info().project.use.baseURL });
	await sessionFor(librarianContext, 'librarian@demo.test');
	await addQuietAndLeaky(await librarianContext.newPage(), quiet, leaky);
	await librarianContext.close();

	// The quieter one first, as the server ranks them; no navigation happened.
	await expect.poll(() => rows(page), { timeout: 5000 }).toEqual([quiet, leaky]);
	await expect(page.locator('[data-ranks-in="browser"]')).toBeAttached();
});

test('without JavaScript the form ranks on the server and the sliders are left out of the address', async ({ browser }) => {
	const page = await designerPage(browser, false);
	await page.goto('/rank?v=-5&thi=85');
	await expect(page.getByText(/parts evaluated/)).toBeVisible();
	await page.getByLabel('Bias across the junction (positive is forward)').fill('-7 V');
	await page.getByRole('button', { name: 'Rank', exact: true }).click();
	await expect(page).toHaveURL(/v=-7/);
	expect(page.url()).not.toContain('slider');
	await expect(page.getByText(/parts evaluated/)).toBeVisible();
});
