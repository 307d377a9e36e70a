// An open project page follows changes made elsewhere without a reload: another person's
// shortlist edit and a lead's decision appear on a designer's open page by themselves.
import { expect, test } from '@playwright/test';
import { sessionFor, whenReady } from './fixtures';

test("another person's changes appear on an open project page without reloading", async ({ browser }) => {
	const baseURL = test.info().project.use.baseURL;
	const designer = await browser.newContext({ baseURL });
	await sessionFor(designer, 'designer@demo.test');
	const page = await designer.newPage();
	const made = await page.request.post('/api/v1/projects', { data: { name: `Live guard ${Date.now().toString(36)}`, requirement: { biasV: -1, temperatureC: 25 } } });
	const { id } = (await made.json()) as { id: number };
	const listed = (await (await page.request.get('/api/v1/junctions?limit=2')).json()) as { items: { id: number; partNumber: string }[] };
	const [first, second] = listed.items;
	expect((await page.request.post(`/api/v1/projects/${id}/shortlist`, { data: { junctionId: first.id } })).status()).toBe(201);

	await page.goto(`/projects/${id}`);
	await whenReady(page);
	// The page's own scripts have settled even with the event stream open.
	await page.waitForLoadState('networkidle');
	const shortlist = page.locator('main');
	await expect(shortlist).toContainText(first.partNumber);
	await expect(page.getByTestId('entry')).toHaveCount(1);

	// A second designer (another context, another session) adds a part; the lead then decides.
	const other = await browser.newContext({ baseURL });
	await sessionFor(other, 'designer@demo.test');
	expect((await other.request.post(`/api/v1/projects/${id}/shortlist`, { data: { junctionId: second.id } })).status()).toBe(201);
	await expect(page.getByTestId('entry')).toHaveCount(2, { timeout: 5000 });
	expect((await other.request.post(`/api/v1/projects/${id}/review`, { data: { action: 'submit', comment: '' } })).status()).toBe(200);
	const lead = await browser.newContext({ baseURL });
	await sessionFor(lead, 'lead@demo.test');
	expect((await lead.request.post(`/api/v1/projects/${id}/review`, { data: { action: 'approve', comment: 'Both fine.' } })).status()).toBe(200);
	await expect(page.locator('h1 ~ [data-state]')).toHaveAttribute('data-state', 'approved', { timeout: 5000 });
	await Promise.all([designer.close(), other.close(), lead.close()]);
});
