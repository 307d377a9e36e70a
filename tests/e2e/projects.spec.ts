import type { Page } from '@playwright/test';
import { addQuietAndLeaky, CATCHER_URL, expect, screenshot, signInAs, test } from './fixtures';

async function signOut(page: Page) {
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page.getByText('You are signed out.')).toBeVisible();
}

/** Reloads until the shortlist shows a prediction for every row (the model cache catches up shortly after a part is added). */
async function waitForVerdicts(page: Page, rows: number) {
	await expect(async () => {
		await page.reload();
		await expect(page.getByTestId('entry').filter({ hasText: /meets|misses/ })).toHaveCount(rows);
	}).toPass({ timeout: 20_000 });
}

test('a shortlist goes from designer to lead, is sent back, resubmitted and approved', async ({ page }) => {
	test.setTimeout(180_000); // four people's turns, each signing in through the mailbox
	const tag = Date.now().toString(36).toUpperCase();
	const quiet = `QM${tag}-LL`;
	const leaky = `QM${tag}-HL`;
	const name = `Electrometer guard ${tag}`;

	// Two parts with given models, entered by a librarian.
	await signInAs(page, 'librarian@demo.test', '/');
	await addQuietAndLeaky(page, quiet, leaky);
	await signOut(page);

	// The designer writes the requirement with SI prefixes and builds the shortlist.
	await signInAs(page, 'designer@demo.test', '/projects/new');
	// Retried as a whole if a late hydration wiped what was typed (development servers).
	await expect(async () => {
		if (!page.url().endsWith('/projects/new')) await page.goto('/projects/new');
		await page.getByLabel('Name').fill(name);
		await page.getByLabel('Description').fill('Input protection for the femtoamp front end, rev B.');
		await page.getByLabel(/Bias across the junction/).fill('-5 V');
		await page.getByLabel(/cold end/).fill('0 °C');
		await page.getByLabel(/hot end/).fill('85 °C');
		await page.getByLabel(/Leakage target/).fill('1n');
		await page.getByLabel(/Clamp current/).fill('1m');
		await page.getByLabel(/Forward-drop limit/).fill('800m');
		await screenshot(page, 'project-new');
		await page.getByRole('button', { name: 'Create the project' }).click();
		await expect(page.getByRole('heading', { level: 1, name })).toBeVisible({ timeout: 5000 });
	}).toPass({ timeout: 40_000 });
	const projectPath = new URL(page.url()).pathname;

	for (const [pn, note] of [
		[quiet, 'Lowest leakage hot'],
		[leaky, 'Cheaper, second source']
	]) {
		await page.getByLabel('Part number').fill(pn);
		await page.getByLabel(/^Note/).fill(note);
		await page.getByRole('button', { name: 'Add to shortlist' }).click();
		await expect(page.getByRole('status').filter({ hasText: `${pn} (Quillmark Semi) added to the shortlist.` })).toBeVisible();
	}
	await waitForVerdicts(page, 2);
	await expect(page.getByTestId('entry').filter({ hasText: quiet })).toHaveAttribute('data-verdict', 'pass');
	await expect(page.getByTestId('entry').filter({ hasText: leaky })).toHaveAttribute('data-verdict', 'fail');
	await expect(page.getByRole('link', { name: "Open this project's ranking →" })).toHaveAttribute('href', '/rank?v=-5&tlo=0&thi=85&ic=1m&vf=0.8&ileak=1n');
	await screenshot(page, 'project-draft');
	// The ranking screen opens on this requirement.
	await page.getByRole('link', { name: "Open this project's ranking →" }).click();
	await expect(page.locator('#op-bias')).toHaveValue(/5/);
	await expect(page.locator('#op-tlo')).toHaveValue(/0/);
	await page.goBack();
	await expect(page.getByRole('heading', { level: 1, name })).toBeVisible();

	await page.getByLabel(/^Comment/).fill('Two candidates; the second only if cost forces it.');
	await page.getByRole('button', { name: 'Send to the lead' }).click();
	await expect(page.getByText('Awaiting the lead').first()).toBeVisible();
	await expect(page.getByText('The shortlist is locked while it is awaiting the lead.')).toBeVisible();
	await signOut(page);

	// The lead follows the link in the mail, signs in, and sends it back.
	const mail = page.getByTestId('mail').filter({ hasText: `“${name}” awaits your decision` }).first();
	// The outbox worker delivers within a few seconds; the mailbox page shows what has arrived.
	await expect(async () => {
		await page.goto('/dev/mailbox?to=lead@demo.test');
		await expect(mail).toBeVisible({ timeout: 1000 });
	}).toPass({ timeout: 30_000 });
	await mail.getByRole('link', { name: new RegExp(`${projectPath}$`) }).click();
	await expect(page).toHaveURL(/\/signin\?next=/);
	await signInAs(page, 'lead@demo.test', projectPath);
	await expect(page).toHaveURL(new RegExp(`${projectPath}$`));
	await expect(page.getByRole('heading', { name: 'Your decision' })).toBeVisible();
	await page.getByLabel(/^Comment/).fill(`Drop ${leaky}: it misses the leakage target.`);
	await page.getByRole('button', { name: 'Send back for changes' }).click();
	await expect(page.getByText('Sent back for changes').first()).toBeVisible();
	await screenshot(page, 'project-returned');
	await signOut(page);

	// The designer removes the leaky part and sends it again.
	await signInAs(page, 'designer@demo.test', projectPath);
	await expect(page.getByTestId('review-event').filter({ hasText: `Drop ${leaky}` })).toBeVisible();
	await page.getByRole('button', { name: `Remove ${leaky} from the shortlist` }).click();
	await expect(page.getByTestId('entry')).toHaveCount(1);
	await page.getByLabel(/^Comment/).fill('Removed; one part left.');
	await page.getByRole('button', { name: 'Send to the lead' }).click();
	await expect(page.getByText('Awaiting the lead').first()).toBeVisible();
	await signOut(page);

	// The lead approves; the exports appear; the printable record renders.
	await signInAs(page, 'lead@demo.test', projectPath);
	await page.getByLabel(/^Comment/).fill('Approved for rev B.');
	await page.getByRole('button', { name: 'Approve the shortlist' }).click();
	await expect(page.getByText('Approved', { exact: true }).first()).toBeVisible();
	await expect(page.getByRole('link', { name: 'SPICE model library (.lib)' })).toBeVisible();
	await screenshot(page, 'project-approved');

	await page.getByRole('link', { name: 'Printable review record' }).click();
	await expect(page.getByRole('heading', { name: 'Predictions at the decision' })).toBeVisible();
	await expect(page.getByText('Approved for rev B.')).toBeVisible();
	await expect(page.getByText(/guarding and clean, dry assembly matter/)).toBeVisible();
	await screenshot(page, 'project-record');
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('button', { name: 'Print this record' })).toBeHidden();
	await screenshot(page, 'project-record-print');

	// The list filtered to approved projects shows it; at 200 % zoom (half the width) the page still reads.
	await page.emulateMedia({ media: 'screen' });
	await page.goto('/projects?state=approved');
	await expect(page.getByRole('link', { name })).toBeVisible();
	await screenshot(page, 'projects-list');
	await page.setViewportSize({ width: 640, height: 900 });
	await page.goto(projectPath);
	await expect(page.getByRole('table', { name: 'Shortlist' })).toBeVisible();
	await screenshot(page, 'project-approved-narrow');

	// The submitter heard of the decision.
	await expect
		.poll(
			async () => {
				const list = (await (await fetch(`${CATCHER_URL}/messages?to=designer@demo.test`)).json()) as { subject: string }[];
				return list.some((m) => m.subject === `Shortlist for “${name}” approved by Marisol Achterberg`);
			},
			{ timeout: 30_000 }
		)
		.toBe(true);
});
