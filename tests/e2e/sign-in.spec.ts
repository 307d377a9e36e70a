import { expect, screenshot, signInAs, test } from './fixtures';

test('a designer signs in through the local mailbox and sees what to do next', async ({ page }) => {
	await page.goto('/');
	await expect(page).toHaveURL(/\/signin/);
	// The demo says on every page where its mail goes.
	await expect(page.getByTestId('demo-band')).toContainText('demo: mail is kept on this machine');
	await screenshot(page, 'signin');
	await signInAs(page, 'designer@demo.test');
	await expect(page.getByRole('heading', { name: /Good to see you, Oona/ })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Open the ranking' })).toBeVisible();
	// The designer's navigation has no admin entry.
	await expect(page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'People' })).toHaveCount(0);
	await expect(page.getByTestId('demo-band')).toBeVisible();
	await screenshot(page, 'home-designer');
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page.getByText('You are signed out.')).toBeVisible();
});

test('the demo band and the local mailbox fit a phone-width screen', async ({ page }) => {
	await page.setViewportSize({ width: 390, height: 844 });
	for (const [path, name] of [
		['/signin', 'signin-390'],
		['/dev/mailbox', 'mailbox-390']
	]) {
		await page.goto(path);
		await expect(page.getByTestId('demo-band')).toBeVisible();
		// No horizontal scroll at phone width.
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
		await screenshot(page, name);
	}
});

test('an admin sees the people screen', async ({ page }) => {
	await signInAs(page, 'admin@demo.test', '/admin');
	await expect(page.getByRole('heading', { name: 'People and roles' })).toBeVisible();
	await expect(page.getByRole('cell', { name: 'designer@demo.test' })).toBeVisible();
	await screenshot(page, 'admin-people');
});
