import { expect, forwardSweep, screenshot, signInAs, test } from './fixtures';

test('a librarian adds a part, uploads two sweeps, accepts the fits and sees the curves', async ({ page }) => {
	// Sign-in through the mailbox, four fits and three pages: more than the default minute on a busy machine.
	test.setTimeout(120_000);
	const number = `E2E-${Date.now().toString(36).toUpperCase()}`;
	await signInAs(page, 'librarian@demo.test', '/parts/new');
	await page.getByLabel('Part number', { exact: true }).fill(number);
	await page.getByLabel('Maker', { exact: true }).fill('Brightwater Test Fab');
	await page.getByLabel('Kind', { exact: true }).selectOption('diode');
	await page.getByLabel('Rated reverse voltage').fill('40 V');
	await page.getByLabel('Rated forward current').fill('100 mA');
	await page.getByRole('button', { name: 'Add to the catalogue' }).click();
	await expect(page.getByRole('heading', { name: number })).toBeVisible();

	await page.getByRole('link', { name: 'Upload runs' }).click();
	await page.waitForLoadState('networkidle');
	await expect(page.getByText("Stay inside the part's ratings")).toBeVisible();
	await page.getByTestId('file-input').setInputFiles([
		{ name: 'unit1_25C.csv', mimeType: 'text/csv', buffer: forwardSweep(2e-15, 1.03, 4, { ranges: true }) },
		{ name: 'unit2_25C.csv', mimeType: 'text/csv', buffer: forwardSweep(3e-15, 1.04, 5, { ranges: true }) }
	]);
	const cards = page.getByTestId('intake');
	await expect(cards).toHaveCount(2);
	// The browser's own reading of each file, before anything is sent.
	await expect(cards.first()).toContainText('Current column');
	await expect(cards.first()).toContainText('I (A)');
	// Fitted as they arrive, with nobody pressing Fit.
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
	const again = forwardSweep(2e-15, 1.03, 4, { ranges: true });
	await page.getByTestId('file-input').setInputFiles([{ name: 'again.csv', mimeType: 'text/csv', buffer: again }]);
	await expect(cards.first()).toHaveAttribute('data-phase', 'fitted');
	await cards.first().getByRole('button', { name: 'Accept and store' }).click();
	await expect(cards.first()).toHaveAttribute('data-phase', 'stored');
	await page.getByTestId('file-input').setInputFiles([{ name: 'again-copy.csv', mimeType: 'text/csv', buffer: again }]);
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
