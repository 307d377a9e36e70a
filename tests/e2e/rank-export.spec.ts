// The ranking downloaded from the screen as a designer does it: the CSV opened and checked
// cell by cell against the rows the screen shows (order, part numbers, the leakage figures
// and forward drops, read back from the screen's SI text), and the .xlsx link giving a workbook.
import Papa from 'papaparse';
import { readFileSync } from 'node:fs';
import { test, expect, sessionFor } from './fixtures';

const DESIGNER = 'designer@demo.test';
const POINT = 'v=-5&tlo=25&thi=85&ic=1m&vf=0.7';

// SI prefixes as the screen writes them (µ and the ASCII u both), for reading its text back.
const PREFIX: Record<string, number> = { a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, µ: 1e-6, u: 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };
function siValue(text: string, unit: string): number {
	const m = new RegExp(`^([−-]?[\\d.]+)\\s*([afpnµumkMG]?)${unit}$`).exec(text.trim());
	if (!m) throw new Error(`"${text}" is not a ${unit} figure`);
	return Number(m[1].replace('−', '-')) * PREFIX[m[2]];
}
/** The screen shows three significant figures: the file's value must round to the same. */
const close = (shown: number, exact: number) => Math.abs(shown - exact) <= 0.006 * Math.abs(exact);

test('the ranking downloads as CSV matching the screen row by row, and as a workbook', async ({ browser }) => {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width: 1280, height: 900 }, acceptDownloads: true });
	await sessionFor(context, DESIGNER);
	const page = await context.newPage();
	await page.goto(`/rank?${POINT}`);
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 45_000 });
	const rows = page.locator('tbody tr');
	await expect(rows.first()).toBeVisible();

	const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.getByTestId('rank-export-csv').click()]);
	expect(csvDownload.suggestedFilename()).toMatch(/^junctionary-ranking-\d{4}-\d{2}-\d{2}\.csv$/);
	const parsed = Papa.parse<string[]>(readFileSync(await csvDownload.path()).toString('utf8').replace(/^\uFEFF/, ''), { skipEmptyLines: false }).data;
	const blank = parsed.findIndex((r) => r.length === 1 && r[0] === '');
	expect(parsed[0][0]).toBe('Operating point: −5.000 V, 25 °C to 85 °C, clamping 1 mA under 0.700 V');
	const head = parsed[blank + 1];
	const data = parsed.slice(blank + 3).filter((r) => r.some((c) => c !== ''));
	const cell = (r: string[], label: string) => r[head.indexOf(label)];

	const shown = await rows.count();
	expect(shown).toBeGreaterThan(5);
	expect(data.length).toBeGreaterThanOrEqual(shown);
	for (let k = 0; k < shown; k++) {
		const row = rows.nth(k);
		const file = data[k];
		expect(cell(file, 'Rank'), `row ${k + 1}`).toBe(String(k + 1));
		expect(cell(file, 'Part number'), `row ${k + 1}`).toBe(await row.getAttribute('data-part'));
		const leak = (await row.locator('td').nth(2).innerText()).replace(/\s+/g, ' ');
		const typ = /typ ([^ ]+ ?[afpnµum]?A)/.exec(leak)![1];
		const worst = /worst ([^ ]+ ?[afpnµum]?A)/.exec(leak)![1];
		expect(close(siValue(typ, 'A'), Number(cell(file, 'Leakage typical, hot end'))), `typical, row ${k + 1}: ${typ}`).toBe(true);
		expect(close(siValue(worst, 'A'), Number(cell(file, 'Leakage worst sample, hot end'))), `worst, row ${k + 1}: ${worst}`).toBe(true);
		const bound = /bound ([^ ]+ ?[afpnµum]?A)/.exec(leak);
		if (bound) expect(close(siValue(bound[1], 'A'), Number(cell(file, 'Leakage bound, hot end'))), `bound, row ${k + 1}`).toBe(true);
		else expect(cell(file, 'Leakage bound, hot end'), `bound, row ${k + 1}`).toBe('');
		const drop = (await row.locator('td').nth(3).innerText()).split('\n')[0];
		const [hot, cold] = drop.split(' / ');
		expect(close(siValue(hot, 'V'), Number(cell(file, 'Forward drop typical, hot end'))), `drop hot, row ${k + 1}`).toBe(true);
		expect(close(siValue(cold, 'V'), Number(cell(file, 'Forward drop typical, cold end'))), `drop cold, row ${k + 1}`).toBe(true);
	}

	const [xlsxDownload] = await Promise.all([page.waitForEvent('download'), page.getByTestId('rank-export-xlsx').click()]);
	expect(xlsxDownload.suggestedFilename()).toMatch(/\.xlsx$/);
	// A workbook is a zip: it starts with the local file header "PK\x03\x04".
	expect([...readFileSync(await xlsxDownload.path()).subarray(0, 4)]).toEqual([0x50, 0x4b, 0x03, 0x04]);
	await context.close();
});
