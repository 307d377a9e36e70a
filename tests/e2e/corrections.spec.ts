// Putting mistakes right on the screens: a librarian fits a run again, corrects it and
// withdraws it; a new part takes a .model card; a designer adds parts to a project from the
// catalogue and the part page and changes the project's people. Each changed screen is
// looked at 1280 px and 390 px wide, and must not scroll sideways.
import type { Browser, Page } from '@playwright/test';
import { expect, screenshot, sessionFor, test } from './fixtures';

const VT25 = 0.025693; // kT/q at 25 °C [V]
const stamp = Date.now().toString(36).toUpperCase();

/** An ideal forward sweep V = N·Vt·ln(I/IS + 1) + I·RS, a salt in the first value making the file new. */
function sweep(IS: number, N = 1.04, RS = 3): string {
	const salt = Math.floor(Math.random() * 9e8) + 1e8; // nine digits, so two test files never meet by chance
	const rows = ['V (V),I (A)'];
	for (let k = 0; k <= 30; k++) {
		const i = 1e-9 * 1e6 ** (k / 30);
		rows.push(`${(N * VT25 * Math.log(i / IS + 1) + i * RS).toPrecision(7)}${k === 0 ? salt : ''},${i.toPrecision(7)}`);
	}
	return rows.join('\n') + '\n';
}

async function as(browser: Browser, email: string, width = 1280): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width, height: 900 } });
	await sessionFor(context, email);
	return context.newPage();
}

async function noSideScroll(page: Page, what: string) {
	const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
	expect(overflow, `${what} must not scroll sideways`).toBeLessThanOrEqual(1);
}

/** Looks at the page as it is at 390 px, then goes back to 1280 px. */
async function narrow(page: Page, name: string) {
	await page.setViewportSize({ width: 390, height: 900 });
	await page.waitForTimeout(200);
	await noSideScroll(page, name);
	await screenshot(page, `${name}-390`);
	await page.setViewportSize({ width: 1280, height: 900 });
}

async function partWithRuns(page: Page, partNumber: string) {
	const made = await page.request.post('/api/v1/junctions', { data: { partNumber, maker: 'Calloway Semitech', kind: 'diode', ratings: { reverseV: 40 } } });
	expect(made.status(), await made.text()).toBe(201);
	const part = (await made.json()) as { id: number };
	const runIds: number[] = [];
	for (const [sample, IS] of [['U1', 2e-15], ['U2', 8e-14]] as const) {
		const r = await page.request.post(`/api/v1/junctions/${part.id}/runs?sample=${sample}&temperatureC=25`, { data: sweep(IS), headers: { 'content-type': 'text/csv' } });
		expect(r.status(), await r.text()).toBe(201);
		runIds.push(((await r.json()) as { id: number }).id);
	}
	return { id: part.id, runIds };
}

test('a librarian fits a run again, corrects its temperature and withdraws it; the part page shows it apart', async ({ browser }) => {
	const page = await as(browser, 'librarian@demo.test');
	const pn = `CW-${stamp}`;
	const part = await partWithRuns(page, pn);
	const leaky = part.runIds[1];
	await page.goto(`/parts/${part.id}`);
	await page.getByRole('link', { name: `Run ${leaky}`, exact: true }).click();
	await expect(page.getByRole('heading', { level: 1 })).toContainText(`Run ${leaky}`);
	await expect(page.getByTestId('run-state')).toHaveText('Counts toward the model');
	await page.waitForLoadState('networkidle');

	const refit = page.locator('form[action="?/refit"]');
	await refit.getByLabel('From').fill('0.40 V');
	await refit.getByLabel('To').fill('450m');
	await refit.getByLabel(/Why/).fill('meter changed range');
	await refit.getByRole('button', { name: 'Fit again' }).click();
	await expect(refit.getByRole('status')).toContainText('Fit version 2 made.');
	await expect(page.getByTestId('fit-versions').locator('tbody tr')).toHaveCount(2);
	await expect(page.locator('tr[data-version="1"]')).toHaveAttribute('data-current', 'false');

	const correct = page.locator('form[action="?/correct"]');
	await correct.getByLabel('Temperature').fill('30 °C');
	await correct.getByRole('button', { name: 'Record the correction' }).click();
	await expect(correct.getByRole('status')).toContainText('Correction recorded as fit version 3.');
	await expect(page.getByRole('heading', { level: 1 })).toContainText('at 30 °C');
	await screenshot(page, 'run-page-1280');
	await narrow(page, 'run-page');

	const withdraw = page.locator('form[action="?/withdraw"]');
	await withdraw.getByRole('button', { name: 'Withdraw this run' }).click();
	// The reason is required: the browser stops the empty form before it is sent.
	await expect(page.getByTestId('run-state')).toHaveText('Counts toward the model');
	await withdraw.getByLabel(/Reason/).fill('Wrong unit in the socket: this was U7.');
	await withdraw.getByRole('button', { name: 'Withdraw this run' }).click();
	await expect(page.getByTestId('run-state')).toHaveText('Withdrawn');
	await expect(page.getByTestId('withdrawn-note')).toContainText('Wrong unit in the socket');
	await expect(page.getByTestId('run-history')).toContainText('withdrew it');
	await expect(page.getByTestId('run-history')).toContainText('fitted it again');
	await expect(page.getByRole('button', { name: 'Put it back into the model' })).toBeVisible();
	await screenshot(page, 'run-page-withdrawn-1280');
	await narrow(page, 'run-page-withdrawn');

	await page.getByRole('link', { name: `← ${pn}` }).click();
	await expect(page.getByTestId('fits-table').locator('tbody tr')).toHaveCount(1);
	await expect(page.getByTestId('withdrawn-runs')).toContainText('Wrong unit in the socket');
	await expect(page.locator('[data-flag="few-samples"]')).toContainText('Only 1 sample');
	await screenshot(page, 'part-page-withdrawn-run-1280');
	await narrow(page, 'part-page-withdrawn-run');
});

test('a new part takes a pasted or chosen .model card, previewed before it is stored', async ({ browser }) => {
	const page = await as(browser, 'librarian@demo.test');
	await page.goto('/parts/new');
	await page.waitForLoadState('networkidle');
	const pn = `CW-CARD-${stamp}`;
	await page.getByLabel('Part number', { exact: true }).fill(pn);
	await page.getByLabel('Maker', { exact: true }).fill('Calloway Semitech');
	await page.getByLabel('Kind', { exact: true }).selectOption('diode');
	const card = page.getByLabel('.model card');
	await card.fill('.model CWX D(N=1.1)');
	await expect(page.getByTestId('card-problem')).toContainText('has no IS');
	await card.fill('.model CWX D(IS=4.2f N=1.06 RS=2.7 KF=1e-16)');
	const preview = page.getByTestId('card-preview');
	await expect(preview).toContainText('CWX');
	await expect(preview).toContainText('4.2 fA');
	await expect(preview).toContainText('KF=1e-16 is not used');
	// A file chosen instead fills the same box and the same preview.
	await card.fill('');
	await page.getByLabel('or a card file').setInputFiles({ name: 'cwx.lib', mimeType: 'text/plain', buffer: Buffer.from('* maker library\n.model CWX D(IS=4.2f N=1.06\n+ RS=2.7)\n') });
	await expect(preview).toContainText('2.7 Ω');
	await page.getByLabel('Where it came from').fill('Calloway library 2031-04');
	await screenshot(page, 'part-new-card-1280');
	await narrow(page, 'part-new-card');
	await page.getByRole('button', { name: 'Add to the catalogue' }).click();
	await expect(page.getByRole('heading', { name: pn })).toBeVisible();
	await expect(page.getByText('Given, not measured: Calloway library 2031-04')).toBeVisible();
	await expect(page.locator('[data-flag="unmeasured"]')).toBeVisible();

	// The edit page's import shows the same preview.
	await page.getByRole('link', { name: 'Edit part' }).click();
	await page.waitForLoadState('networkidle');
	await page.getByLabel('.model card').fill('.model CWY D(IS=5f N=1.07)');
	await expect(page.getByTestId('card-preview')).toContainText('5 fA');
	await screenshot(page, 'part-edit-card-1280');
	await narrow(page, 'part-edit-card');
});

test('a designer adds a part to an open project from the catalogue and from the part page', async ({ browser }) => {
	const lib = await as(browser, 'librarian@demo.test');
	const pn = `CW-ADD-${stamp}`;
	const part = await partWithRuns(lib, pn);
	const page = await as(browser, 'designer@demo.test');
	const names = [`Pico clamp ${stamp}`, `Sample-hold ${stamp}`];
	for (const name of names) {
		const r = await page.request.post('/api/v1/projects', { data: { name, requirement: { biasV: -1, temperatureC: 40 } } });
		expect(r.status(), await r.text()).toBe(201);
	}

	await page.goto(`/catalogue?q=${pn}`);
	await page.waitForLoadState('networkidle');
	await page.getByRole('button', { name: `Add to project ${pn}` }).click();
	let dialog = page.getByRole('dialog');
	await dialog.getByRole('combobox').selectOption({ label: `${names[0]} (draft)` });
	await dialog.getByLabel(/Note/).fill('found in the catalogue');
	await screenshot(page, 'catalogue-add-to-project-1280');
	await dialog.getByRole('button', { name: 'Add to shortlist' }).click();
	await expect(dialog.getByRole('status')).toContainText(`${pn} is on the shortlist of ${names[0]}`);
	await dialog.getByRole('button', { name: 'Close' }).click();
	await narrow(page, 'catalogue-add-to-project');

	await page.goto(`/parts/${part.id}`);
	await page.waitForLoadState('networkidle');
	await page.getByRole('button', { name: `Add to project ${pn}` }).click();
	dialog = page.getByRole('dialog');
	// Only open projects of this person are offered; the same project twice is refused in words.
	await dialog.getByRole('combobox').selectOption({ label: `${names[0]} (draft)` });
	await dialog.getByRole('button', { name: 'Add to shortlist' }).click();
	await expect(dialog.getByRole('status')).toContainText('already on this shortlist');
	await dialog.getByRole('combobox').selectOption({ label: `${names[1]} (draft)` });
	await dialog.getByLabel(/Note/).fill('second source');
	await dialog.getByRole('button', { name: 'Add to shortlist' }).click();
	await expect(dialog.getByRole('status')).toContainText(`${pn} is on the shortlist of ${names[1]}`);
	await screenshot(page, 'part-add-to-project-1280');
	await dialog.getByRole('button', { name: 'Close' }).click();
	await narrow(page, 'part-add-to-project');
});

test("a designer changes an open review's lead and removes a member; the activity and the mailbox say so", async ({ browser }) => {
	const page = await as(browser, 'designer@demo.test');
	const name = `Ion meter guard ${stamp}`;
	const parts = await page.request.get('/api/v1/junctions?limit=1');
	const junctionId = ((await parts.json()) as { items: { id: number }[] }).items[0].id;
	const made = await page.request.post('/api/v1/projects', { data: { name, requirement: { biasV: -1, temperatureC: 25 }, memberEmails: ['librarian@demo.test'] } });
	const { id } = (await made.json()) as { id: number };
	expect((await page.request.post(`/api/v1/projects/${id}/shortlist`, { data: { junctionId } })).status()).toBe(201);
	expect((await page.request.post(`/api/v1/projects/${id}/review`, { data: { action: 'submit', comment: '' } })).status()).toBe(200);

	await page.goto(`/projects/${id}`);
	await page.waitForLoadState('networkidle');
	const people = page.getByTestId('people');
	await people.getByLabel('Who decides').selectOption({ label: 'Marisol Achterberg' });
	await people.getByRole('button', { name: 'Change the lead' }).click();
	await expect(people.getByRole('status')).toContainText('lead@demo.test now decides');
	await expect(people).toContainText('Decided by Marisol Achterberg');
	await people.getByRole('button', { name: 'Remove Tobiah Quell' }).click();
	await expect(people.getByRole('status')).toContainText('librarian@demo.test is no longer a member');
	await expect(page.getByText('named Marisol Achterberg the lead')).toBeVisible();
	await screenshot(page, 'project-people-1280');
	await narrow(page, 'project-people');

	await page.goto('/dev/mailbox?to=librarian@demo.test');
	await expect(async () => {
		await page.reload();
		await expect(page.getByTestId('mail').filter({ hasText: `You are no longer on the project “${name}”` })).toBeVisible({ timeout: 1000 });
	}).toPass({ timeout: 30_000 });
});
