// A librarian's everyday forms: ratings typed with prefixes and units and read back as you
// type, the kind refused in its display names, and an upload page that fits each readable
// file as it arrives and says at once, in words, what is wrong with the others.
import { expect, forwardSweep, screenshotWidths, sessionFor, test, whenReady } from './fixtures';

let session: Awaited<ReturnType<import('@playwright/test').BrowserContext['storageState']>>;
test.beforeAll(async ({ browser }) => {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL });
	await sessionFor(context, 'librarian@demo.test');
	session = await context.storageState();
	await context.close();
});
test.use({ storageState: async ({}, use) => use(session) });

test('ratings take prefixes and units, show what was understood, and the kind error names kinds as the list does', async ({ page }) => {
	const number = `LD-${Date.now().toString(36).toUpperCase()}`;
	await page.goto('/parts/new');
	await whenReady(page);
	await page.getByLabel('Part number', { exact: true }).fill(number);
	await page.getByLabel('Maker', { exact: true }).fill('Brightwater Test Fab');
	const forward = page.getByLabel('Rated forward current');
	await forward.fill('200 mA');
	await expect(page.getByTestId('forwardA-reading')).toHaveText('Understood: 200 mA = 0.2 A');
	await forward.fill('200 mX');
	await expect(forward).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByTestId('forwardA-reading')).toHaveText('Not read as a current: write it like 200 mA or 10p.');
	await forward.fill('200m');
	await page.getByLabel('Rated reverse voltage').fill('75 V');
	await page.getByLabel('Rated junction temperature').fill('150 °C');
	await expect(page.getByTestId('junctionC-reading')).toHaveText('Understood: 150 °C');
	// No kind chosen: the server refuses, naming the kinds as the list shows them.
	await page.getByRole('button', { name: 'Add to the catalogue' }).click();
	const kindMsg = page.locator('#kind-msg');
	await expect(kindMsg).toHaveText('Choose the kind: PN diode, Schottky diode, BJT base–emitter, Diode-connected BJT, JFET gate junction, LED.');
	await expect(kindMsg).not.toContainText('bjt-be');
	await screenshotWidths(page, 'part-new-errors');

	await page.getByLabel('Kind', { exact: true }).selectOption('diode');
	await page.getByRole('button', { name: 'Add to the catalogue' }).click();
	await expect(page.getByRole('heading', { name: number })).toBeVisible();
	await expect(page.locator('dd', { hasText: '200 mA' })).toBeVisible(); // not 200 A
	await page.goto(`${new URL(page.url()).pathname}/edit`);
	await expect(page.getByLabel('Rated forward current')).toHaveValue('200 mA');
	await expect(page.getByLabel('Rated reverse voltage')).toHaveValue('75 V');
	await expect(page.getByLabel('Rated junction temperature')).toHaveValue('150 °C');
	await screenshotWidths(page, 'part-edit');
});

test('each readable file is fitted as it arrives; a bad one says why at once, in its own card, and Fit tries again', async ({ page }) => {
	const number = `LU-${Date.now().toString(36).toUpperCase()}`;
	const res = await page.request.post('/api/v1/junctions', { data: { partNumber: number, maker: 'Brightwater Test Fab', kind: 'diode', ratings: { reverseV: '40 V', forwardA: '100 mA' } } });
	expect(res.status(), await res.text()).toBe(201);
	const { id } = await res.json();
	await page.goto(`/parts/${id}/upload`);
	await whenReady(page);
	await expect(page.getByText('Each readable file is fitted as it arrives')).toBeVisible();
	await page.getByTestId('file-input').setInputFiles([
		{ name: 'unit1_25C.csv', mimeType: 'text/csv', buffer: forwardSweep(2e-15, 1.03, 4) },
		{ name: 'broken.csv', mimeType: 'text/csv', buffer: Buffer.from('V (V),I (A)\n0.5,abc\nhello,world\n') },
		{ name: 'empty.csv', mimeType: 'text/csv', buffer: Buffer.alloc(0) },
		{ name: 'unit2_250C.csv', mimeType: 'text/csv', buffer: forwardSweep(3e-15, 1.04, 5) }
	]);
	const card = (file: string) => page.locator(`[data-testid="intake"][data-file="${file}"]`);
	// Fitted with nobody pressing Fit.
	await expect(card('unit1_25C.csv')).toHaveAttribute('data-phase', 'fitted');
	await expect(card('unit1_25C.csv').getByTestId('fit-result')).toContainText('IS');
	// The broken and the empty file say so at once, in red, in words, and only once.
	for (const [file, words] of [
		['broken.csv', /row \d/],
		['empty.csv', /The file is empty/]
	] as const) {
		const c = card(file);
		await expect(c).toHaveAttribute('data-phase', 'problem');
		await expect(c.getByTestId('phase')).toHaveText('cannot be fitted as it is');
		await expect(c.getByTestId('upload-error')).toContainText(words);
		await expect(c.getByTestId('upload-error')).toHaveCount(1);
		await expect(c.getByRole('progressbar')).toHaveCount(0);
		await expect(c).not.toContainText('ready to fit');
	}
	// 250 °C from the file name is refused by the server, in words and without a status code…
	const hot = card('unit2_250C.csv');
	await expect(hot).toHaveAttribute('data-phase', 'refused');
	await expect(hot.getByTestId('upload-error')).toHaveText(/looks like kelvin/);
	await expect(hot.getByTestId('upload-error')).not.toContainText(/\b(400|413|422)\b|HTTP/);
	await expect(hot.getByRole('progressbar')).toHaveCount(0);
	await screenshotWidths(page, 'upload-on-arrival');
	// …and Fit tries again once the temperature is put right.
	await hot.getByLabel('Temperature').fill('25 °C');
	await expect(hot).toContainText('Understood: 25 °C');
	// The window left out takes units too, and says at once what it cannot read.
	await hot.getByLabel('From', { exact: true }).fill('550 mV');
	await expect(hot.getByTestId('excludeFrom-reading')).toHaveText('Understood: 550 mV = 0.55 V');
	await hot.getByLabel('To', { exact: true }).fill('half');
	await expect(hot.getByTestId('excludeTo-reading')).toHaveText('Not read as a voltage: write it like −5 V or 612 mV.');
	await hot.getByLabel('From', { exact: true }).fill('');
	await hot.getByLabel('To', { exact: true }).fill('');
	await hot.getByRole('button', { name: 'Fit again' }).click();
	await expect(hot).toHaveAttribute('data-phase', 'fitted');
	await expect(hot.getByTestId('upload-error')).toHaveCount(0);

	await hot.getByRole('button', { name: 'Accept and store' }).click();
	await expect(hot).toHaveAttribute('data-phase', 'stored');
	await screenshotWidths(page, 'upload-after-retry');
});
