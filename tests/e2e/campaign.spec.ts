// A whole demo campaign on the screens: the parts list from seed/campaign previewed and
// imported, then its bench folder (as campaign.zip) mapped by the name pattern, imported with
// progress, and summarised; then the catalogue downloaded as .xlsx and read cell by cell.
// Each screen is looked at 1280 px and 390 px wide, and must not scroll sideways.
import ExcelJS from 'exceljs';
import { readFileSync } from 'node:fs';
import type { Browser, Page } from '@playwright/test';
import { expect, screenshot, sessionFor, test } from './fixtures';

const LIST = 'seed/campaign/parts.csv';
const ZIP = 'seed/campaign/campaign.zip';

async function as(browser: Browser, email: string, width = 1280): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width, height: 900 }, acceptDownloads: true });
	await sessionFor(context, email);
	return context.newPage();
}

async function noSideScroll(page: Page, what: string) {
	const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
	expect(overflow, `${what} must not scroll sideways`).toBeLessThanOrEqual(1);
}

test('the demo campaign: parts list, then its folder of sweeps, with progress and a summary', async ({ browser }) => {
	test.setTimeout(180_000);
	const page = await as(browser, 'librarian@demo.test');
	await page.goto('/parts/import');
	await page.waitForLoadState('networkidle');
	await page.getByLabel('Parts list').setInputFiles(LIST);
	await page.getByRole('button', { name: 'Preview' }).click();
	await expect(page.getByRole('heading', { name: /Preview of parts.csv/ })).toBeVisible();
	const rows = page.locator('tbody tr[data-row]');
	await expect(rows).toHaveCount(4);
	// The header's mA: 200 mA is shown as stored, 200 mA (0.2 A).
	await expect(page.locator('tr[data-row="2"] td[data-column="Forward current (mA)"]')).toHaveText(/200 mA/);
	await screenshot(page, 'campaign-parts-preview-1280');
	const importButton = page.getByRole('button', { name: /^Import \d+ new/ });
	if (await importButton.count()) {
		await importButton.click();
		await expect(page.getByRole('status').filter({ hasText: /Imported parts.csv: 4 new parts/ })).toBeVisible();
	} else await expect(page.getByText(/already holds every part/)).toBeVisible();

	await page.goto('/parts/import/sweeps');
	await page.waitForLoadState('networkidle');
	// A development server may still be hydrating: choose the file again until the page reads it.
	await expect(async () => {
		await page.getByTestId('files-input').setInputFiles(ZIP);
		await expect(page.getByRole('heading', { name: '36 files' })).toBeVisible({ timeout: 3000 });
	}).toPass({ timeout: 30_000 });
	await expect(page.getByText(/36\s+mapped to a part/)).toBeVisible();
	const first = page.locator('tr[data-file="sweeps/FCS-D5_S1_25C_both.csv"]');
	await expect(first).toContainText('FCS-D5');
	await expect(first).toContainText('25 °C');
	await expect(first).toContainText('both');
	// Editing the pattern re-maps at once: a pattern without {sample} maps nothing and says why.
	await page.getByLabel('File-name pattern').fill('{part}_{temperature}');
	await expect(page.getByText('the pattern needs {sample}').first()).toBeVisible();
	await page.getByLabel('File-name pattern').fill('{part}_{sample}_{temperature}');
	await screenshot(page, 'campaign-sweeps-ready-1280');

	await page.getByRole('button', { name: 'Import 36 files' }).click();
	await expect(page.getByTestId('progress')).toBeVisible();
	const summary = page.getByTestId('summary');
	await expect(summary).toBeVisible({ timeout: 150_000 });
	await expect(page.getByTestId('progress')).toHaveAttribute('value', '36');
	const text = (await summary.textContent()) ?? '';
	const stored = Number(/(\d+)\s+stored/.exec(text)![1]);
	const dup = Number(/(\d+)\s+duplicates/.exec(text)![1]);
	expect(stored + dup, text).toBe(36);
	expect(text).toMatch(/0\s+refused/);
	await screenshot(page, 'campaign-sweeps-done-1280');
	const download = page.waitForEvent('download');
	await page.getByRole('link', { name: /Download the summary/ }).click();
	const csv = readFileSync(await (await download).path(), 'utf8').trim().split(/\r?\n/);
	expect(csv).toHaveLength(37);
	expect(csv[0]).toMatch(/^File,Maker,Part number,Sample/);

	for (const path of ['/parts/import', '/parts/import/sweeps']) {
		const narrow = await as(browser, 'librarian@demo.test', 390);
		await narrow.goto(path);
		await narrow.waitForLoadState('networkidle');
		await noSideScroll(narrow, path);
		await screenshot(narrow, `campaign${path.replace(/\//g, '-')}-390`);
		await narrow.context().close();
	}
	await page.context().close();
});

test('the catalogue downloads as .xlsx, and its cells match the screen', async ({ browser }) => {
	const page = await as(browser, 'designer@demo.test');
	await page.goto('/catalogue?kind=schottky');
	await page.waitForLoadState('networkidle');
	const shown = await page.locator('tbody tr').count();
	const download = page.waitForEvent('download');
	await page.getByTestId('export-xlsx').click();
	const wb = new ExcelJS.Workbook();
	await wb.xlsx.load(readFileSync(await (await download).path()) as unknown as ExcelJS.Buffer);
	const ws = wb.worksheets[0];
	const head = (ws.getRow(1).values as unknown[]).slice(1);
	expect(head.slice(0, 3)).toEqual(['Part number', 'Maker', 'Kind']);
	expect(ws.getRow(2).getCell(head.indexOf('IS typical') + 1).value).toBe('A');
	expect(ws.rowCount - 2).toBeGreaterThanOrEqual(Math.min(shown, 25));
	for (let k = 3; k <= ws.rowCount; k++) {
		expect(ws.getRow(k).getCell(3).value).toBe('Schottky diode');
		const is = ws.getRow(k).getCell(head.indexOf('IS typical') + 1).value;
		expect(is === null || typeof is === 'number').toBe(true);
	}
	await noSideScroll(page, 'catalogue');
	await page.context().close();
});
