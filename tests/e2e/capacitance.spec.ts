// Capacitance on the screens: a librarian drops a C–V file on the upload page, the page reads
// it as C–V from its header, fits it with the stray capacitance typed in, shows the fitted
// curve and stores it; the part page shows the measured points, the fitted curve per sample and
// the residuals; a designer's ranking, which had no capacitance for the part, now shows it.
// Each screen is looked at 1280 px and 390 px wide and must not scroll sideways.
import type { Browser, Page } from '@playwright/test';
import { expect, screenshot, sessionFor, test } from './fixtures';

const VT25 = 0.025693; // kT/q at 25 °C [V]
const stamp = Date.now().toString(36).toUpperCase();

/** An ideal forward sweep V = N·Vt·ln(I/IS + 1) + I·RS; a salt in the first value makes the file new. */
function ivSweep(IS = 3e-15, N = 1.03, RS = 2): string {
	const salt = Math.floor(Math.random() * 900) + 100;
	const rows = ['V (V),I (A)'];
	for (let k = 0; k <= 30; k++) {
		const i = 1e-9 * 1e6 ** (k / 30);
		rows.push(`${(N * VT25 * Math.log(i / IS + 1) + i * RS).toPrecision(7)}${k === 0 ? salt : ''},${i.toPrecision(7)}`);
	}
	return rows.join('\n') + '\n';
}

/**
 * An LCR meter's C–V file: reverse voltage as magnitudes, semicolons and decimal commas, the
 * readings C = CJO·(1 − V/VJ)^(−M) (the SPICE depletion formula) plus a 0.3 pF fixture.
 */
function cvSweep(): string {
	const rows = ['VR (V);Cp (pF);Freq (kHz);Level (mV)'];
	const salt = Math.floor(Math.random() * 900) + 100;
	for (let k = 0; k <= 20; k++) {
		const v = -10 + k * 0.5;
		const c = 2.2e-12 * (1 - v / 0.72) ** -0.34 + 0.3e-12;
		rows.push(`${String(-v || 0).replace('.', ',')}${k === 0 ? `,0000${salt}` : ''};${(c * 1e12).toPrecision(6).replace('.', ',')};1000;30`);
	}
	return rows.join('\n') + '\n';
}

async function as(browser: Browser, email: string): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width: 1280, height: 900 } });
	await sessionFor(context, email);
	const page = await context.newPage();
	page.on('pageerror', (e) => console.error('page error:', e.message));
	return page;
}

/** Looks at the page at 390 px (no sideways scroll), then goes back to 1280 px. */
async function narrow(page: Page, name: string) {
	await page.setViewportSize({ width: 390, height: 900 });
	await page.waitForTimeout(200);
	const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
	expect(overflow, `${name} must not scroll sideways`).toBeLessThanOrEqual(1);
	await screenshot(page, `${name}-390`);
	await page.setViewportSize({ width: 1280, height: 900 });
}

/** Opens the ranking at −2 V, 25 °C, listing only the part. */
async function openRanking(page: Page, partNumber: string) {
	await page.goto(`/rank?v=-2&thi=25&q=${encodeURIComponent(partNumber)}`);
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 30_000 });
}

/** The capacitance shown in the ranking's row for the part ('' when it shows none). */
async function rankedCapacitance(page: Page, partNumber: string): Promise<string> {
	const row = page.locator(`tbody tr[data-part="${partNumber}"]`);
	if ((await row.count()) === 0) return 'not listed';
	const text = (await row.textContent()) ?? '';
	return /capacitance\s*([\d.]+\s*[fpnµ]F)/.exec(text)?.[1] ?? '';
}

test('a C–V file is read, fitted with its stray, stored, drawn on the part page and shown in the ranking', async ({ browser }) => {
	test.setTimeout(180_000);
	const librarian = await as(browser, 'librarian@demo.test');
	const pn = `CV-${stamp}`;
	const made = await librarian.request.post('/api/v1/junctions', { data: { partNumber: pn, maker: 'Calloway Semitech', kind: 'diode', ratings: { reverseV: 40 } } });
	expect(made.status(), await made.text()).toBe(201);
	const part = (await made.json()) as { id: number };
	const iv = await librarian.request.post(`/api/v1/junctions/${part.id}/runs?sample=U1&temperatureC=25`, { data: ivSweep(), headers: { 'content-type': 'text/csv' } });
	expect(iv.status(), await iv.text()).toBe(201);

	// The designer's ranking knows the part but not its capacitance.
	const designer = await as(browser, 'designer@demo.test');
	await openRanking(designer, pn);
	await expect.poll(() => rankedCapacitance(designer, pn), { timeout: 20_000 }).toBe('');

	await librarian.goto(`/parts/${part.id}/upload`);
	await librarian.waitForLoadState('networkidle');
	await librarian.getByTestId('file-input').setInputFiles([{ name: 'U1_25C_cv.csv', mimeType: 'text/csv', buffer: Buffer.from(cvSweep()) }]);
	const card = librarian.getByTestId('intake');
	await expect(card).toHaveCount(1);
	// The browser's own reading: C–V from the header, the capacitance column and the meter's settings.
	await expect(card.getByTestId('measurement')).toHaveValue('auto');
	await expect(card.getByTestId('measurement').locator('option:checked')).toHaveText(/C–V \(capacitance\), from the header/);
	await expect(card).toContainText('Capacitance column');
	await expect(card).toContainText('Cp (pF)');
	await expect(card).toContainText('1 MHz');
	// Fitted as it arrives, with no stray; the stray typed afterwards makes that fit out of date.
	await expect(card).toHaveAttribute('data-phase', 'fitted');
	await card.getByLabel('Stray capacitance').fill('0.3 pF');
	await expect(card.getByTestId('phase')).toHaveText('changed since the fit: fit again');
	await expect(card.getByRole('button', { name: 'Accept and store' })).toBeDisabled();
	await card.getByRole('button', { name: 'Fit again', exact: true }).click();
	await expect(card).toHaveAttribute('data-phase', 'fitted');
	await expect(card.getByTestId('phase')).toHaveText('fitted: accept or discard');
	const result = card.getByTestId('fit-result');
	await expect(result).toContainText('CJO');
	// The junction's own CJO, the fixture's 0.3 pF subtracted: 2.2 pF as generated.
	await expect(result).toContainText('2.2 pF');
	await expect(result).toContainText('300 fF stray subtracted');
	await expect(card.locator('canvas')).toHaveCount(2);
	await screenshot(librarian, 'capacitance-upload-fitted');
	await narrow(librarian, 'capacitance-upload-fitted');
	await card.getByRole('button', { name: 'Accept and store' }).click();
	await expect(card).toHaveAttribute('data-phase', 'stored');

	// The part page: measured points and the fitted curve per sample, residuals, the median parameters.
	await librarian.goto(`/parts/${part.id}`);
	const section = librarian.getByTestId('capacitance');
	await expect(section.getByTestId('capacitance-source')).toHaveAttribute('data-source', 'measured');
	await expect(section.getByTestId('capacitance-params')).toContainText('2.2 pF');
	await expect(section.getByTestId('cv-chart').locator('canvas')).toHaveCount(2);
	await expect(section.getByTestId('cv-fits-table').locator('tbody tr')).toHaveCount(1);
	await expect(section.getByTestId('cv-fits-table')).toContainText('300 fF');
	await section.scrollIntoViewIfNeeded();
	await screenshot(librarian, 'capacitance-part-page');
	await narrow(librarian, 'capacitance-part-page');

	// The ranking's capacitance column now has the measured value at −2 V: 2.2 pF·(1 + 2/0.72)^(−0.34) ≈ 1.4 pF.
	await openRanking(designer, pn);
	await expect.poll(() => rankedCapacitance(designer, pn), { timeout: 20_000 }).toMatch(/^1\.\d+ pF$/);
	await screenshot(designer, 'capacitance-ranking');
});
