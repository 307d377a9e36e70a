// An admin's day: role changes asked for and confirmed, a person deactivated (signed out
// and their tokens stopped at once) and reactivated, the audit log read through filters
// and pages, and API tokens with an end date and a copy button.
import type { Browser, Page } from '@playwright/test';
import { request as httpRequest } from '@playwright/test';
import { CATCHER_URL, expect, screenshotWidths, sessionFor, test, whenReady } from './fixtures';

const stamp = Date.now().toString(36);
const NAME = `Ilse Varrow ${stamp}`;
const EMAIL = `ilse.${stamp}@demo.test`;

async function personPage(browser: Browser, email: string, next: string): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, permissions: ['clipboard-read', 'clipboard-write'] });
	await sessionFor(context, email);
	const page = await context.newPage();
	await page.goto(next);
	await whenReady(page);
	return page;
}

/** Calls the API with a bearer token only (no cookies). */
async function withToken(token: string): Promise<number> {
	const ctx = await httpRequest.newContext({ baseURL: test.info().project.use.baseURL });
	const res = await ctx.get('/api/v1/junctions?limit=1', { headers: { authorization: `Bearer ${token}` } });
	await ctx.dispose();
	return res.status();
}

test('an admin changes roles only after confirming, and is told what changed', async ({ browser }) => {
	const admin = await personPage(browser, 'admin@demo.test', '/admin');
	await admin.getByLabel('E-mail').fill(EMAIL);
	await admin.getByLabel('Name', { exact: true }).fill(NAME);
	await admin.getByRole('checkbox', { name: 'designer' }).check();
	await admin.getByRole('button', { name: 'Send invitation' }).click();
	await expect(admin.getByRole('status').filter({ hasText: `Invitation sent to ${EMAIL}` })).toBeVisible();

	const grant = admin.getByRole('button', { name: `Grant the lead role to ${NAME}` });
	await grant.click();
	await expect(admin.getByText(`Grant the lead role to ${NAME}? They will be able to decide on submitted shortlists.`)).toBeVisible();
	const yes = admin.getByRole('button', { name: 'Grant the role' });
	await expect(yes).toBeFocused();
	await screenshotWidths(admin, 'admin-confirm-role');
	// Cancel changes nothing.
	await admin.getByRole('link', { name: 'Cancel' }).click();
	await expect(grant).toBeVisible();
	await expect(admin.getByTestId('change-done')).toHaveCount(0);
	// Confirmed, it is done and said.
	await grant.click();
	await admin.getByRole('button', { name: 'Grant the role' }).click();
	await expect(admin.getByTestId('change-done')).toHaveText(`${NAME} now holds the lead role.`);
	// The button's name starts with the word it shows, then says what pressing it does.
	const remove = admin.getByRole('button', { name: `Holds the lead role: remove it from ${NAME}` });
	await expect(remove).toHaveText('✓ holds');
	await remove.click();
	await expect(admin.getByText(`Remove the lead role from ${NAME}? They will no longer be able to decide on submitted shortlists.`)).toBeVisible();
	await admin.getByRole('button', { name: 'Remove the role' }).click();
	await expect(admin.getByTestId('change-done')).toHaveText(`${NAME} no longer holds the lead role.`);
	await expect(grant).toBeVisible();
	await screenshotWidths(admin, 'admin-role-done');
	await admin.context().close();
});

test('a token has an end date and a copy button; deactivating its owner stops it, their session and their sign-in at once', async ({ browser }) => {
	test.setTimeout(150_000);
	const person = await personPage(browser, EMAIL, '/account/tokens');
	// A 403 says what is needed in words, not as a permission code.
	await person.goto('/parts/new');
	await expect(person.getByRole('heading', { name: 'Not open to your role' })).toBeVisible();
	await expect(person.locator('main')).toContainText('Adding and changing parts, samples and measurement runs needs the librarian role.');
	await expect(person.locator('main')).not.toContainText(/\(\w+:\w+\)/);
	await screenshotWidths(person, 'forbidden');

	await person.goto('/account/tokens');
	await whenReady(person);
	const last = person.getByLabel('Last day it works');
	await expect(last).toHaveValue(/^\d{4}-\d{2}-\d{2}$/);
	await person.getByLabel('Name').fill('bench PC 7');
	await person.getByRole('button', { name: 'Create token' }).click();
	const token = (await person.getByTestId('new-token').innerText()).trim();
	expect(token).toMatch(/^jct_/);
	// The end date reads as the last day chosen (not the midnight after it), as Intl writes that day here.
	const lastDay = await person.evaluate(
		(day) => new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric', timeZone: 'UTC' }).format(new Date(`${day}T12:00:00Z`)),
		await last.inputValue()
	);
	await expect(person.getByRole('status')).toContainText(`working through ${lastDay}.`);
	await person.getByRole('button', { name: 'Copy' }).click();
	await expect(person.getByTestId('copy-result')).toHaveText('Copied to the clipboard.');
	expect(await person.evaluate(() => navigator.clipboard.readText())).toBe(token);
	const row = person.getByTestId('token').filter({ hasText: 'bench PC 7' });
	await expect(row).toHaveAttribute('data-state', 'works');
	await expect(row.locator('time')).toHaveCount(2); // created, last day (never used yet)
	await expect(row.locator('time').nth(1)).toHaveText(lastDay);
	await screenshotWidths(person, 'tokens-created');
	expect(await withToken(token)).toBe(200);

	// The admin deactivates the person, after saying yes.
	const admin = await personPage(browser, 'admin@demo.test', '/admin');
	await admin.getByRole('button', { name: `Deactivate ${NAME}` }).click();
	// The people list is long by now (every test adds people): allow the answer time on a busy machine.
	await expect(admin.getByText(`Deactivate ${NAME}? They are signed out everywhere at once`)).toBeVisible({ timeout: 15_000 });
	await admin.getByRole('button', { name: 'Deactivate', exact: true }).click();
	await expect(admin.getByTestId('change-done')).toContainText(`${NAME} is deactivated`);
	await expect(admin.locator(`[data-email="${EMAIL}"]`)).toContainText('deactivated');
	await screenshotWidths(admin, 'admin-deactivated');

	// At once: the token is refused, the open session is gone, and no sign-in link is sent.
	expect(await withToken(token)).toBe(401);
	await person.goto('/account/tokens');
	await expect(person).toHaveURL(/\/signin/);
	const before = ((await (await fetch(`${CATCHER_URL}/messages?to=${encodeURIComponent(EMAIL)}`)).json()) as unknown[]).length;
	await person.getByLabel('Work e-mail').fill(EMAIL);
	await person.getByRole('button', { name: /sign-in link/i }).click();
	await expect(person.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
	await person.waitForTimeout(3000);
	expect(((await (await fetch(`${CATCHER_URL}/messages?to=${encodeURIComponent(EMAIL)}`)).json()) as unknown[]).length).toBe(before);
	await person.context().close();

	// Reactivated, they may sign in again; the old token stays revoked.
	await admin.getByRole('button', { name: `Reactivate ${NAME}` }).click();
	await admin.getByRole('button', { name: 'Reactivate', exact: true }).click();
	await expect(admin.getByTestId('change-done')).toHaveText(`${NAME} can sign in again. Their old API tokens stay revoked; they can make new ones.`);
	expect(await withToken(token)).toBe(401);

	// The audit log tells it, filtered by who acted and what, and pages through the rest.
	await admin.getByRole('link', { name: 'audit log' }).click();
	await whenReady(admin);
	await expect(admin.getByText(/entries; page 1 of \d+/)).toBeVisible();
	await admin.getByRole('link', { name: 'Older →' }).click();
	await expect(admin).toHaveURL(/page=2/);
	await expect(admin.getByText(/page 2 of \d+/).first()).toBeVisible();
	const who = admin.getByLabel('Person', { exact: true });
	await who.selectOption({ label: (await who.locator('option', { hasText: '(admin@demo.test)' }).innerText()).trim() });
	await admin.getByLabel('Action', { exact: true }).selectOption({ label: 'Person deactivated' });
	const today = new Date().toISOString().slice(0, 10);
	await admin.getByLabel('From', { exact: true }).fill(today);
	await admin.getByLabel('To', { exact: true }).fill(today);
	await admin.getByRole('button', { name: 'Show' }).click();
	await expect(admin).toHaveURL(/action=person\.deactivated/);
	const entry = admin.getByTestId('audit-entry').filter({ hasText: NAME });
	await expect(entry).toContainText(`deactivated ${NAME} (1 session ended, 1 API token revoked)`);
	await expect(admin.getByTestId('audit-entry').filter({ hasNotText: 'deactivated' })).toHaveCount(0);
	await screenshotWidths(admin, 'audit-filtered');
	await admin.context().close();
});
