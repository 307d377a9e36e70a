// The designer's ranking screen: live re-ranking as the operating point changes,
// adding a part to a shortlist, and how the page looks at 1280 px and at 200 % zoom.
import postgres from 'postgres';
import { test, expect, signInAs, screenshot } from './fixtures';

const DESIGNER = 'designer@demo.test';

// Two invented parts whose order flips with bias: LOWSHUNT-1 has the smaller IS
// (lower leakage near zero bias) but a 1 TΩ shunt that dominates at −10 V, where
// HIGHIS-1 (larger IS, no shunt) leaks less. At −0.1 V: LOWSHUNT-1 ≈ 0.1 V/1 TΩ = 0.1 pA
// plus 1 fA; HIGHIS-1 ≈ 5 pA. At −10 V: LOWSHUNT-1 ≈ 10 pA; HIGHIS-1 ≈ 5 pA.
const stamp = Date.now().toString(36);
const LOW = `LOWSHUNT-${stamp}`;
const HIGH = `HIGHIS-${stamp}`;
let sql: postgres.Sql | null = null;
let ids: number[] = [];
/** One sign-in for the whole file (sign-in links are limited per address). */
let session: Awaited<ReturnType<import('@playwright/test').BrowserContext['storageState']>>;

test.beforeAll(async ({ browser }) => {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL });
	const page = await context.newPage();
	await signInAs(page, DESIGNER, '/rank');
	session = await context.storageState();
	await context.close();

	sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
	const measured = { minCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true, worstRmsResidualV: 5e-4 };
	for (const [partNumber, model] of [
		[LOW, { IS: 1e-15, N: 1, TNOM: 27, RSH: 1e12, EG: 1.11, XTI: 3 }],
		[HIGH, { IS: 5e-12, N: 1, TNOM: 27, EG: 1.11, XTI: 3 }]
	] as const) {
		const [row] = await sql`insert into parts (part_number, maker, kind, package, rated_reverse_v, shunt_factor_per_10k)
			values (${partNumber}, 'Orrin Devices', 'diode', 'SOD-323', 50, 1) returning id`;
		const samples = [model, { ...model, IS: model.IS * 1.2 }, { ...model, IS: model.IS * 0.9 }];
		await sql`insert into part_models (part_id, typical, sample_models, measured, sample_count, is_measured, version)
			values (${row.id}, ${sql.json(model)}, ${sql.json(samples)}, ${sql.json(measured)}, 3, true, 1)`;
		await sql`select pg_notify('junction_models', ${String(row.id)})`;
		ids.push(row.id);
	}
});

test.afterAll(async () => {
	if (sql && ids.length) {
		await sql`delete from parts where id = any(${ids})`;
		for (const id of ids) await sql`select pg_notify('junction_models', ${String(id)})`;
	}
	await sql?.end();
});

/** Part numbers in table order, restricted to this test's two parts. */
async function order(page: import('@playwright/test').Page) {
	const names = await page.locator('tbody tr').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-part')));
	return names.filter((n) => n === LOW || n === HIGH);
}

/** A page in a context that carries the file's one sign-in. */
async function signedInPage(browser: import('@playwright/test').Browser, options: Parameters<typeof browser.newContext>[0] = {}) {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, storageState: session, ...options });
	const page = await context.newPage();
	page.on('pageerror', (e) => console.error('page error:', e.message));
	return page;
}

/** Opens /rank and waits until the page is live (hydrated), so typing is heard. */
async function openRank(page: import('@playwright/test').Page, query: string) {
	await page.goto(`/rank?${query}`);
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 20_000 });
}

test('a designer changes bias and temperature and the order changes live', async ({ browser }) => {
	const page = await signedInPage(browser);
	await openRank(page, `v=-0.1&thi=25&q=${stamp}`);
	await expect(page.getByRole('heading', { name: 'Ranked by worst-case leakage' })).toBeVisible();
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
	const bias = page.getByLabel('Bias across the junction (positive is forward)');
	const before = page.url();
	await bias.fill('-10 V');
	await expect.poll(() => order(page)).toEqual([HIGH, LOW]);
	expect(page.url()).not.toBe(before);
	expect(new URL(page.url()).searchParams.get('v')).toBe('-10');
	// Hotter: HIGHIS-1's IS grows ~×4000 from 25 to 125 °C, the shunt (factor 1 per 10 K) does not.
	await page.getByLabel('Highest temperature').fill('125');
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
	// A typo is explained beside the box and the ranking stays as it was.
	await bias.fill('minus five');
	await expect(page.getByText(/expected a voltage/)).toBeVisible();
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
});

test('a designer adds a part to a project shortlist', async ({ browser }) => {
	const page = await signedInPage(browser);
	const projectName = `Electrometer front end ${stamp}`;
	const created = await page.request.post('/api/v1/projects', {
		data: { name: projectName, requirement: { biasV: -5, temperatureC: 25 } }
	});
	expect(created.status(), await created.text()).toBe(201);
	const project = (await created.json()) as { id: number };
	await openRank(page, `v=-5&thi=25&q=${stamp}`);
	const row = page.locator(`tr[data-part="${LOW}"]`);
	await row.getByRole('button', { name: `Shortlist ${LOW}` }).click();
	const dialog = page.getByRole('dialog');
	await expect(dialog).toBeVisible();
	await dialog.getByRole('combobox').selectOption({ label: `${projectName} (draft)` });
	await dialog.getByLabel(/Note/).fill('lowest leakage near zero bias');
	await dialog.getByRole('button', { name: 'Add to shortlist' }).click();
	await expect(dialog.getByRole('status')).toContainText(`${LOW} is on the shortlist of ${projectName}`);
	const after = await page.request.get(`/api/v1/projects/${project.id}`);
	expect(JSON.stringify(await after.json())).toContain('lowest leakage near zero bias');
});

test('screenshots at 1280 px and at 200 % zoom, keyboard reachable', async ({ browser }) => {
	const page = await signedInPage(browser);
	await openRank(page, 'v=-5&tlo=25&thi=85&ic=1m&vf=0.7&rs=10G&verr=1m');
	await expect(page.locator('tbody tr').first()).toBeVisible();
	await page.waitForTimeout(300); // let the charts draw before the picture
	await screenshot(page, 'rank-1280');
	// Tab from the top reaches the bias box, and it shows a visible focus ring.
	await page.keyboard.press('Tab');
	let reached = false;
	for (let i = 0; i < 30 && !reached; i++) {
		reached = await page.evaluate(() => document.activeElement?.id === 'op-bias');
		if (!reached) await page.keyboard.press('Tab');
	}
	expect(reached).toBe(true);
	const outline = await page.evaluate(() => getComputedStyle(document.activeElement!).outlineStyle);
	expect(outline).not.toBe('none');
	// 200 %: same CSS viewport halved, device pixels doubled — what browser zoom does.
	const zpage = await signedInPage(browser, { viewport: { width: 640, height: 900 }, deviceScaleFactor: 2 });
	await openRank(zpage, 'v=-5&tlo=25&thi=85&ic=1m&vf=0.7&rs=10G&verr=1m');
	await expect(zpage.locator('tbody tr').first()).toBeVisible();
	await zpage.waitForTimeout(300);
	await screenshot(zpage, 'rank-200pct');
	const [overflow, offenders] = await zpage.evaluate(() => {
		const width = document.documentElement.clientWidth;
		const wide = [...document.querySelectorAll('body *')]
			.filter((el) => el.getBoundingClientRect().right > width + 1 && !el.closest('.overflow-x-auto'))
			.map((el) => `${el.tagName.toLowerCase()}.${String(el.className).slice(0, 50)}`);
		const w = document.querySelector('.overflow-x-auto') as HTMLElement | null;
		const info = w ? ` wrapper ${w.clientWidth}/${w.scrollWidth} ${getComputedStyle(w).overflowX} right ${w.getBoundingClientRect().right}` : '';
		const far = [...document.querySelectorAll('body *')].sort((a, b) => b.getBoundingClientRect().right - a.getBoundingClientRect().right)[0];
		return [document.documentElement.scrollWidth - width, wide.slice(0, 5).join(' | ') + info + ` farthest ${far?.tagName}.${String(far?.className).slice(0, 80)} ${far?.getBoundingClientRect().right}`] as const;
	});
	expect(overflow, `the page itself must not scroll sideways at 200 %: ${offenders}`).toBeLessThanOrEqual(1);
});
