// The two main tasks done with the keyboard alone (WCAG 2.1.1), every stop showing where the
// focus is (2.4.7): a designer sets an operating point, reads the ranking and shortlists a
// part; a librarian adds a part, uploads a sweep and sees its fit. No clicks, no fills: Tab,
// typing, Enter, Space and Escape, as a person without a mouse works.
import type { Browser, Locator, Page } from '@playwright/test';
import { expect, forwardSweep, sessionFor, test, whenReady } from './fixtures';

const stamp = Date.now().toString(36).toUpperCase();

async function keyboardPage(browser: Browser, email: string): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width: 1280, height: 900 } });
	await sessionFor(context, email);
	return context.newPage();
}

/** The focused element draws a visible ring: an outline at least 2 px wide, or a box shadow. */
async function expectFocusRing(target: Locator) {
	const ring = await target.evaluate((el) => {
		const s = getComputedStyle(el);
		return { outline: s.outlineStyle !== 'none' ? parseFloat(s.outlineWidth) : 0, shadow: s.boxShadow };
	});
	expect(ring.outline >= 2 || ring.shadow !== 'none', `focus ring on ${await target.evaluate((el) => el.outerHTML.slice(0, 80))}`).toBe(true);
}

/** Presses Tab (or Shift+Tab) until `target` has the focus, checking the ring where it lands. */
async function tabTo(page: Page, target: Locator, { back = false, most = 120 } = {}) {
	for (let i = 0; i < most; i++) {
		if (await target.evaluate((el) => el === document.activeElement).catch(() => false)) {
			await expectFocusRing(target);
			return;
		}
		await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
	}
	throw new Error(`Tab never reached ${target}`);
}

async function retype(page: Page, text: string) {
	await page.keyboard.press('ControlOrMeta+a');
	await page.keyboard.type(text);
}

test('a designer sets an operating point, reads the ranking and shortlists a part, by keyboard alone', async ({ browser }) => {
	const page = await keyboardPage(browser, 'designer@demo.test');
	const projectName = `Keyboard walk ${stamp}`;
	const created = await page.request.post('/api/v1/projects', { data: { name: projectName, requirement: { biasV: -2, temperatureRangeC: [25, 70] } } });
	expect(created.status(), await created.text()).toBe(201);
	const project = (await created.json()) as { id: number };

	await page.goto('/rank?v=-5&tlo=25&thi=85&ic=1m&vf=0.7');
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 45_000 });
	// The skip link is the first stop and leads past the header.
	await page.keyboard.press('Tab');
	const skip = page.getByRole('link', { name: 'Skip to content' });
	await expect(skip).toBeFocused();
	await expect(skip).toBeVisible();

	// The operating point: bias, then the hot end, typed into the sentence.
	await tabTo(page, page.locator('#op-bias'));
	await retype(page, '-2 V');
	await expect.poll(() => new URL(page.url()).searchParams.get('v')).toBe('-2');
	await tabTo(page, page.locator('#op-thi'));
	await retype(page, '70 °C');
	await expect.poll(() => new URL(page.url()).searchParams.get('thi')).toBe('70');

	// Reading the ranking: its heading names the basis; in the first flagged row the part,
	// then its flag marks, then its shortlist button are stops in reading order.
	await expect(page.getByRole('heading', { name: /^Ranked by/ })).toBeVisible();
	const first = page.locator('tbody tr:has([data-flag])').first();
	const part = (await first.getAttribute('data-part'))!;
	await tabTo(page, first.getByRole('link', { name: part, exact: true }));
	// A flag mark shows its words when the focus reaches it.
	const mark = first.locator('[data-flag]').first();
	await tabTo(page, mark);
	await expect(mark.getByRole('tooltip', { includeHidden: true })).toBeVisible();

	// Shortlisting: the row's button opens the dialog with the focus inside it.
	const shortlist = first.getByRole('button', { name: `Shortlist ${part}` });
	await tabTo(page, shortlist);
	await page.keyboard.press('Enter');
	const dialog = page.getByRole('dialog');
	await expect(dialog).toBeVisible();
	const choose = dialog.getByRole('combobox');
	await tabTo(page, choose);
	// A closed select takes typed letters as a choice.
	await page.keyboard.type(projectName);
	await expect(choose).toHaveValue(String(project.id));
	await tabTo(page, dialog.getByLabel(/Note/));
	await page.keyboard.type('chosen without a mouse');
	await tabTo(page, dialog.getByRole('button', { name: 'Add to shortlist' }));
	await page.keyboard.press('Enter');
	await expect(dialog.getByRole('status')).toContainText(`${part} is on the shortlist of ${projectName}`);
	// Escape closes the dialog and gives the focus back to the button that opened it.
	await page.keyboard.press('Escape');
	await expect(dialog).toBeHidden();
	await expect(shortlist).toBeFocused();

	const after = await (await page.request.get(`/api/v1/projects/${project.id}`)).json();
	expect(JSON.stringify(after)).toContain('chosen without a mouse');
	await page.context().close();
});

test('a librarian adds a part, uploads a sweep and reads its fit, by keyboard alone', async ({ browser }) => {
	const page = await keyboardPage(browser, 'librarian@demo.test');
	const partNumber = `KB${stamp}-1`;
	await page.goto('/parts/new');
	await whenReady(page);

	await tabTo(page, page.getByLabel('Part number', { exact: true }));
	await page.keyboard.type(partNumber);
	await tabTo(page, page.getByLabel('Maker', { exact: true }));
	await page.keyboard.type('Quillmark Semi');
	const kind = page.getByLabel('Kind', { exact: true });
	await tabTo(page, kind);
	await page.keyboard.type('PN');
	await expect(kind).toHaveValue('diode');
	await tabTo(page, page.getByRole('button', { name: 'Add to the catalogue' }));
	await page.keyboard.press('Enter');
	await expect(page.getByRole('heading', { level: 1, name: partNumber })).toBeVisible();
	await whenReady(page);

	// To the upload page by its link; the file chooser opens from the keyboard.
	await tabTo(page, page.getByRole('link', { name: 'Upload runs' }));
	await page.keyboard.press('Enter');
	await expect(page.getByRole('heading', { name: `Upload runs for ${partNumber}` })).toBeVisible();
	await whenReady(page);
	const input = page.getByTestId('file-input');
	await tabTo(page, input);
	const chooser = page.waitForEvent('filechooser');
	await page.keyboard.press('Space');
	await (await chooser).setFiles({ name: 'U1_25C.csv', mimeType: 'text/csv', buffer: forwardSweep(3e-15, 1.05, 0.9) });

	const card = page.getByTestId('intake');
	await expect(card).toHaveAttribute('data-phase', 'fitted', { timeout: 30_000 });
	// The fit reads as text, not only as a chart: IS and N as the file was made (3 fA, 1.05).
	await expect(card).toContainText(/IS\s*3 fA/);
	await expect(card).toContainText(/N\s*1\.05/);
	await tabTo(page, card.getByRole('button', { name: 'Accept and store' }));
	await page.keyboard.press('Enter');
	await expect(card).toHaveAttribute('data-phase', 'stored', { timeout: 30_000 });

	const found = await (await page.request.get(`/api/v1/junctions?q=${encodeURIComponent(partNumber)}`)).json();
	const id = found.items.find((p: { partNumber: string }) => p.partNumber === partNumber).id;
	const detail = await (await page.request.get(`/api/v1/junctions/${id}`)).json();
	expect(detail.runs).toHaveLength(1);
	// The stored fit is the sweep's model: IS 3 fA and N 1.05 as the file was made.
	expect(detail.model.typical.N).toBeCloseTo(1.05, 1);
	expect(Math.abs(Math.log10(detail.model.typical.IS / 3e-15))).toBeLessThan(0.1);
	await page.context().close();
});
