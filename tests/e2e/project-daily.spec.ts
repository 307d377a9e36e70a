// Projects as a designer and a lead use them every day: a project started from the ranking
// with its operating point, typed quantities read back as you type, kinds and dates as a
// person reads them, and an approval over parts that miss the requirement.
import type { Browser, Page } from '@playwright/test';
import { addQuietAndLeaky, CATCHER_URL, expect, screenshotWidths, sessionFor, test, whenReady } from './fixtures';

const stamp = Date.now().toString(36).toUpperCase();
const QUIET = `QV${stamp}-LL`;
const LEAKY = `QV${stamp}-HL`;

/** A signed-in page for one person, in the reader's locale and time zone given. */
async function personPage(browser: Browser, email: string, next: string, locale = 'en-GB', timezoneId = 'Europe/London'): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, locale, timezoneId });
	await sessionFor(context, email);
	const page = await context.newPage();
	await page.goto(next);
	await whenReady(page);
	return page;
}

test('a project starts from the ranking with its operating point, an allowed error and a source resistance', async ({ browser }) => {
	// The ranking's refusals name its fields in its words, not the API's keys.
	const page = await personPage(browser, 'designer@demo.test', '/rank?v=-5&tlo=0&thi=85&ic=-1m&vf=0.7&rs=0&verr=1m');
	await expect(page.locator('main')).toContainText('The clamp current must be greater than zero.');
	await expect(page.locator('main')).toContainText('The source resistance must be greater than zero.');
	await expect(page.locator('main')).not.toContainText(/clampCurrentA|sourceResistanceOhm|maxForwardDropV/);
	await page.goto('/rank?v=-5&tlo=0&thi=85&ic=1m&vf=0.7&rs=1G&verr=1m');
	await whenReady(page);
	await expect(page.locator('[data-live="yes"]')).toBeVisible();
	const start = page.getByRole('link', { name: 'Start a project at this operating point →' });
	await expect(start).toHaveAttribute('href', /^\/projects\/new\?v=-5&tlo=0&thi=85&ic=1m&vf=0\.7&rs=1G&verr=1m/);
	await start.click();
	await expect(page.getByRole('heading', { name: 'Start a project' })).toBeVisible();
	await expect(page.getByText('The operating point comes from the ranking screen.')).toBeVisible();
	await expect(page.getByLabel(/^Bias across the junction/)).toHaveValue('−5 V');
	await expect(page.getByLabel('Temperature, cold end')).toHaveValue('0 °C');
	await expect(page.getByLabel('Temperature, hot end')).toHaveValue('85 °C');
	await expect(page.getByLabel('Clamp current')).toHaveValue('1 mA');
	await expect(page.getByLabel('Allowed error')).toHaveValue('1 mV');
	await expect(page.getByLabel('Source resistance')).toHaveValue('1 GΩ');
	await expect(page.getByLabel(/^Leakage target/)).toHaveValue('');
	await expect(page.getByTestId('budget')).toHaveText('1 mV across 1 GΩ allows up to 1 pA of leakage.');
	await screenshotWidths(page, 'project-new-from-ranking');

	const name = `Guarded pH input ${stamp}`;
	await page.getByLabel('Name').fill(name);
	await page.getByRole('button', { name: 'Create the project' }).click();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();
	const req = page.locator('section[aria-labelledby="req-title"]');
	await expect(req).toContainText('Allowed error');
	await expect(req).toContainText('1 mV');
	await expect(req).toContainText('Leakage this allows');
	await expect(req).toContainText('1 pA');
	// Back to the ranking on the same point, in short exact numbers.
	await expect(page.getByRole('link', { name: "Open this project's ranking →" })).toHaveAttribute('href', '/rank?v=-5&tlo=0&thi=85&ic=1m&vf=0.7&rs=1G&verr=1m');
	await page.context().close();
});

test('quantity fields say what they understood as you type, and refuse what they cannot read beside the field', async ({ browser }) => {
	const page = await personPage(browser, 'designer@demo.test', '/projects/new');
	await page.waitForLoadState('networkidle');
	const clamp = page.getByLabel('Clamp current');
	await clamp.fill('200 mA');
	await expect(page.getByTestId('clamp-reading')).toHaveText('Understood: 200 mA = 0.2 A');
	const bias = page.getByLabel(/^Bias across the junction/);
	await bias.fill('5 xV');
	await expect(bias).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByTestId('bias-reading')).toHaveText('Not read as a voltage: write it like −5 V or 612 mV.');
	await bias.fill('-5 V');
	await expect(page.getByTestId('bias-reading')).toHaveText('Understood: −5 V');
	await page.getByLabel('Temperature, hot end').fill('358.15 K');
	await expect(page.getByTestId('tempHi-reading')).toHaveText('Understood: 85 °C');
	// A value the parser reads but the requirement refuses comes back from the server, in the form's words.
	await page.getByLabel('Name').fill(`Refused ${stamp}`);
	await page.getByLabel(/^Leakage target/).fill('0');
	await page.getByLabel('Clamp current').fill('-1 mA');
	await page.getByRole('button', { name: 'Create the project' }).click();
	await expect(page.getByTestId('leakageTarget-reading')).toHaveText('The leakage target must be above zero.');
	await expect(page.getByTestId('clamp-reading')).toHaveText('The clamp current must be above zero.');
	await expect(page.locator('main')).not.toContainText(/[a-z]+[A-Z][a-z]+A must|clampCurrentA|leakageTargetA/);
	await screenshotWidths(page, 'project-new-errors');
	await page.context().close();
});

test('the shortlist reads as a person writes it, and a lead approving over misses sees them and must give a note', async ({ browser }) => {
	test.setTimeout(180_000);
	// Two parts, one far leakier than the target.
	const librarian = await personPage(browser, 'librarian@demo.test', '/');
	await addQuietAndLeaky(librarian, QUIET, LEAKY);
	await librarian.context().close();

	// The designer reads dates in German, on Berlin's clock.
	const designer = await personPage(browser, 'designer@demo.test', '/projects/new', 'de-DE', 'Europe/Berlin');
	const name = `Electrometer clamp ${stamp}`;
	await expect(async () => {
		if (!designer.url().endsWith('/projects/new')) await designer.goto('/projects/new');
		await designer.getByLabel('Name').fill(name);
		await designer.getByLabel(/^Bias across the junction/).fill('-5 V');
		await designer.getByLabel('Temperature, hot end').fill('85 °C');
		await designer.getByLabel(/^Leakage target/).fill('10f');
		await designer.getByLabel('Clamp current').fill('1m');
		await designer.getByLabel('Forward-drop limit').fill('800m');
		await designer.getByRole('button', { name: 'Create the project' }).click();
		await expect(designer.getByRole('heading', { level: 1, name })).toBeVisible({ timeout: 5000 });
	}).toPass({ timeout: 40_000 });
	const projectPath = new URL(designer.url()).pathname;
	for (const typed of [QUIET.toLowerCase(), LEAKY.toLowerCase()]) {
		await designer.getByLabel('Part number').fill(typed);
		await designer.getByRole('button', { name: 'Add to shortlist' }).click();
		// Told back as catalogued, not as typed.
		await expect(designer.getByRole('status').filter({ hasText: `${typed.toUpperCase()} (Quillmark Semi) added to the shortlist.` })).toBeVisible();
	}
	await expect(async () => {
		await designer.reload();
		await expect(designer.getByTestId('entry').filter({ hasText: /meets|misses/ })).toHaveCount(2);
	}).toPass({ timeout: 20_000 });
	await expect(designer.getByTestId('entry').first()).toContainText('Quillmark Semi · PN diode');
	await expect(designer.getByTestId('entry').first()).not.toContainText('· diode');

	// Dates: Intl.DateTimeFormat in the reader's locale and zone (the reference formatter of ECMA-402).
	const times = designer.locator('main time');
	await expect(times.first()).toBeVisible();
	for (const t of await times.all()) {
		const iso = (await t.getAttribute('datetime'))!;
		const want = new Intl.DateTimeFormat('de-DE', { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', timeZone: 'Europe/Berlin' }).format(new Date(iso));
		await expect(t).toHaveText(want);
	}
	await expect(designer.locator('main')).not.toContainText('UTC');
	await designer.getByRole('button', { name: 'Send to the lead' }).click();
	await expect(designer.getByText('Awaiting the lead').first()).toBeVisible();
	await screenshotWidths(designer, 'project-in-review');
	await designer.context().close();

	// The lead sees what misses before approving, and approves only with a note.
	const lead = await personPage(browser, 'lead@demo.test', projectPath);
	const misses = lead.getByTestId('shortfalls');
	await expect(misses).toContainText('2 of 2 parts miss the requirement');
	await expect(misses).toContainText(new RegExp(`${LEAKY}: leakage .+ is [\\d,]+× the 10 fA allowed`));
	await screenshotWidths(lead, 'project-decide-misses');
	await lead.getByRole('button', { name: 'Approve the shortlist…' }).click();
	const note = lead.getByLabel(/^Why approve despite these misses/);
	await expect(note).toBeFocused();
	await expect(note).toHaveAttribute('required', '');
	// An empty note is not sent: the browser holds the form, and the server would refuse it too.
	await lead.getByRole('button', { name: 'Approve with these misses' }).click();
	await expect(lead.getByText('Awaiting the lead').first()).toBeVisible();
	await screenshotWidths(lead, 'project-decide-confirm');
	await note.fill(`The 10 fA target was a typo for 10 nA; ${QUIET} is fine at that.`);
	await lead.getByRole('button', { name: 'Approve with these misses' }).click();
	await expect(lead.getByText('Approved', { exact: true }).first()).toBeVisible();

	// The CSV: kinds by name, canonical short numbers (the target typed as 10f is 1e-14).
	const csv = await (await lead.request.get(`${projectPath}/export/csv`)).text();
	const [head, ...rows] = csv.trim().split('\r\n');
	const col = (n: string) => head.split(',').indexOf(n);
	expect(rows[0].split(',')[col('kind')]).toBe('PN diode');
	expect(rows[0].split(',')[col('leakage_target_A')]).toBe('1e-14');
	expect(csv).not.toMatch(/\d\.\d*0000000\d/);
	// The model library's comments name the kind as the screens do.
	const lib = await (await lead.request.get(`${projectPath}/export/spice`)).text();
	expect(lib).toContain(`* ${QUIET} (Quillmark Semi, PN diode), model version`);
	expect(lib).not.toMatch(/, diode\), model version/);
	// The printable record names kinds as people read them and carries the note.
	await lead.goto(`${projectPath}/export/record`);
	await expect(lead.locator('main')).toContainText('Quillmark Semi · PN diode');
	await expect(lead.locator('main')).toContainText('The 10 fA target was a typo for 10 nA');
	await screenshotWidths(lead, 'project-record');
	await lead.context().close();

	// The mail reads as a colleague would write it.
	await expect
		.poll(async () => {
			const list = (await (await fetch(`${CATCHER_URL}/messages?to=designer@demo.test`)).json()) as { subject: string; text: string }[];
			return list.find((m) => m.subject === `Shortlist for “${name}” approved by Marisol Achterberg`)?.text ?? '';
		}, { timeout: 30_000 })
		.toContain(`Marisol Achterberg has approved the shortlist for “${name}”.`);
	const list = (await (await fetch(`${CATCHER_URL}/messages?to=designer@demo.test`)).json()) as { subject: string; text: string }[];
	const mail = list.find((m) => m.subject.includes(name))!;
	expect(mail.text).toContain('Marisol wrote:');
	expect(mail.text).not.toContain('It is now:');
	expect(mail.text).toMatch(new RegExp(`${LEAKY} \\(Quillmark Semi\\): .*misses: leakage`));
});
