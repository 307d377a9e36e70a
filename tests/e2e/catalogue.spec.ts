import { expect, screenshot, signInAs, test } from './fixtures';

const VT25 = 0.025693;
/** A forward sweep with a little noise; the salt makes each run's file new to the catalogue. */
function sweep(IS: number, N: number, RS: number): Buffer {
	const salt = Math.floor(Math.random() * 900) + 100;
	const rows = ['V (V),I (A),Range'];
	for (let k = 0; k <= 30; k++) {
		const i = 1e-9 * 1e6 ** (k / 30);
		const v = N * VT25 * Math.log(i / IS + 1) + i * RS + 1e-4 * Math.sin(k * 7.1);
		rows.push(`${v.toPrecision(6)}${k === 0 ? salt : ''},${i.toPrecision(6)},${i < 1e-8 ? '10nA' : i < 1e-6 ? '1uA' : '100uA'}`);
	}
	return Buffer.from(rows.join('\n') + '\n');
}

test('a librarian adds a part, uploads two sweeps, accepts the fits and sees the curves', async ({ page }) => {
	const number = `E2E-${Date.now().toString(36).toUpperCase()}`;
	await signInAs(page, 'librarian@demo.test', '/parts/new');
	await page.getByLabel('Part number', { exact: true }).fill(number);
	await page.getByLabel('Maker', { exact: true }).fill('Brightwater Test Fab');
	await page.getByLabel('Kind', { exact: true }).selectOption('diode');
	await page.getByLabel('Rated reverse voltage (V)').fill('40');
	await page.getByLabel('Rated forward current (A)').fill('0.1');
	await page.getByRole('button', { name: 'Add to the catalogue' }).click();
	await expect(page.getByRole('heading', { name: number })).toBeVisible();

	await page.getByRole('link', { name: 'Upload runs' }).click();
	await page.waitForLoadState('networkidle');
	await expect(page.getByText("Stay inside the part's ratings")).toBeVisible();
	await page.getByTestId('file-input').setInputFiles([
		{ name: 'unit1_25C.csv', mimeType: 'text/csv', buffer: sweep(2e-15, 1.03, 4) },
		{ name: 'unit2_25C.csv', mimeType: 'text/csv', buffer: sweep(3e-15, 1.04, 5) }
	]);
	const cards = page.getByTestId('intake');
	await expect(cards).toHaveCount(2);
	// The browser's own reading of each file, before anything is sent.
	await expect(cards.first()).toContainText('Current column');
	await expect(cards.first()).toContainText('I (A)');
	await page.getByRole('button', { name: 'Fit all new files' }).click();
	for (const c of await cards.all()) await expect(c).toHaveAttribute('data-phase', 'fitted');
	await expect(page.getByRole('progressbar').first()).toHaveAttribute('aria-valuenow', '100');
	await expect(cards.first().getByTestId('fit-result')).toContainText('IS');
	await screenshot(page, 'catalogue-upload-fitted');

	for (const c of await cards.all()) {
		await c.getByRole('button', { name: 'Accept and store' }).click();
		await expect(c).toHaveAttribute('data-phase', 'stored');
	}
	await screenshot(page, 'catalogue-upload-stored');

	await page.getByRole('link', { name: `← ${number}` }).click();
	await expect(page.getByTestId('fits-table').locator('tbody tr')).toHaveCount(2);
	await expect(page.locator('[data-testid^="iv-"] canvas').first()).toBeVisible();
	await expect(page.locator('[data-flag="few-samples"]')).toBeVisible();
	await screenshot(page, 'catalogue-part-page');

	// The same file again is refused, saying which run has it.
	await page.goto(page.url() + '/upload');
	await page.waitForLoadState('networkidle');
	const again = sweep(2e-15, 1.03, 4);
	await page.getByTestId('file-input').setInputFiles([{ name: 'again.csv', mimeType: 'text/csv', buffer: again }]);
	await page.getByRole('button', { name: 'Fit all new files' }).click();
	await expect(cards.first()).toHaveAttribute('data-phase', 'fitted');
	await cards.first().getByRole('button', { name: 'Accept and store' }).click();
	await expect(cards.first()).toHaveAttribute('data-phase', 'stored');
	await page.getByTestId('file-input').setInputFiles([{ name: 'again-copy.csv', mimeType: 'text/csv', buffer: again }]);
	await page.getByRole('button', { name: 'Fit all new files' }).click();
	await expect(cards.nth(1)).toHaveAttribute('data-phase', 'refused');
	await expect(cards.nth(1).getByTestId('upload-error')).toContainText('already uploaded as run');
	await screenshot(page, 'catalogue-duplicate-refused');
});

test('a designer finds a part by a misspelt number and the link survives a reload', async ({ page }) => {
	await signInAs(page, 'designer@demo.test', '/catalogue');
	await expect(page.getByRole('heading', { name: 'Catalogue' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Add a part' })).toHaveCount(0);
	await page.getByRole('searchbox').fill('HBR-D20');
	await expect(page.getByRole('link', { name: 'HRB-D20P' })).toBeVisible();
	await expect(page).toHaveURL(/q=HBR-D20/);
	await screenshot(page, 'catalogue-search-typo');
	await page.reload();
	await page.waitForLoadState('networkidle');
	await expect(page.getByRole('searchbox')).toHaveValue('HBR-D20');
	await expect(page.getByRole('link', { name: 'HRB-D20P' })).toBeVisible();
	await page.getByRole('link', { name: 'HRB-D20P' }).click();
	await expect(page.getByRole('heading', { name: 'HRB-D20P' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Upload runs' })).toHaveCount(0);
	await screenshot(page, 'catalogue-part-designer');
});
