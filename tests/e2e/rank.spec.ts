// The designer's ranking screen: live re-ranking as the operating point changes, the
// ranking basis chosen from the keyboard, adding a part to a shortlist, and how the page
// looks at 1280 px and at 200 % zoom.
import postgres from 'postgres';
import { test, expect, signInAs, screenshot } from './fixtures';

const DESIGNER = 'designer@demo.test';

// Two invented parts whose order flips with bias: LOWSHUNT-1 has the smaller IS
// (lower leakage near zero bias) but a 1 TΩ shunt that dominates at −10 V, where
// HIGHIS-1 (larger IS, no shunt) leaks less. At −0.1 V: LOWSHUNT-1 ≈ 0.1 V/1 TΩ = 0.1 pA
// plus 1 fA; HIGHIS-1 ≈ 5 pA. At −10 V: LOWSHUNT-1 ≈ 10 pA; HIGHIS-1 ≈ 5 pA.
// WIDE-1's three samples spread ×25 (IS 10, 50 and 250 aA, leaking about IS at −0.1 V):
// the lowest typical (0.05 pA), a worst sample of 0.25 pA between the others, and a bound
// far above both (exp(ȳ + k·s) with s = ln 5 and k = 5.311 for n = 3, Natrella NBS
// Handbook 91 Table A-7: ≈ 0.05 pA × 5^5.311 ≈ 250 pA); HIGHIS-1's bound is ≈ 11 pA.
const stamp = Date.now().toString(36);
const LOW = `LOWSHUNT-${stamp}`;
const HIGH = `HIGHIS-${stamp}`;
const WIDE = `WIDE-${stamp}`;
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
	for (const [partNumber, model, spread] of [
		[LOW, { IS: 1e-15, N: 1, TNOM: 27, RSH: 1e12, EG: 1.11, XTI: 3 }, [1, 1.2, 0.9]],
		[HIGH, { IS: 5e-12, N: 1, TNOM: 27, EG: 1.11, XTI: 3 }, [1, 1.2, 0.9]],
		[WIDE, { IS: 5e-14, N: 1, TNOM: 27, EG: 1.11, XTI: 3 }, [1, 5, 0.2]]
	] as const) {
		const [row] = await sql`insert into parts (part_number, maker, kind, package, rated_reverse_v, shunt_factor_per_10k)
			values (${partNumber}, 'Orrin Devices', 'diode', 'SOD-323', 50, 1) returning id`;
		const samples = spread.map((f) => ({ ...model, IS: model.IS * f }));
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

/** Part numbers in table order, restricted to the given parts of this test (by default LOW and HIGH). */
async function order(page: import('@playwright/test').Page, only: string[] = [LOW, HIGH]) {
	const names = await page.locator('tbody tr').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-part')));
	return names.filter((n): n is string => n !== null && only.includes(n));
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
	// On the worst sample: HIGHIS-1's bound (≈ 11 pA) would sit above LOWSHUNT-1's 10 pA at −10 V.
	await openRank(page, `v=-0.1&thi=25&q=${stamp}&basis=worst`);
	await expect(page.getByRole('heading', { name: 'Ranked by worst measured sample' })).toBeVisible();
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
	const bias = page.getByLabel('Bias across the junction (positive is forward)');
	const before = page.url();
	await bias.fill('-10 V');
	await expect.poll(() => order(page)).toEqual([HIGH, LOW]);
	// The address follows once the fields keep still (a quarter second).
	await expect.poll(() => new URL(page.url()).searchParams.get('v')).toBe('-10');
	expect(page.url()).not.toBe(before);
	// Hotter: HIGHIS-1's IS grows ~×4000 from 25 to 125 °C, the shunt (factor 1 per 10 K) does not.
	await page.getByLabel('Highest temperature').fill('125');
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
	// A typo is explained beside the box and the ranking stays as it was.
	await bias.fill('minus five');
	await expect(page.getByText(/expected a voltage/)).toBeVisible();
	await expect.poll(() => order(page)).toEqual([LOW, HIGH]);
});

test('a designer picks the ranking basis from the keyboard; the heading, the order and the URL follow', async ({ browser }) => {
	const page = await signedInPage(browser);
	const all = [LOW, HIGH, WIDE];
	await openRank(page, `v=-0.1&thi=25&q=${stamp}`);
	await expect(page.getByRole('heading', { name: 'Ranked by statistical bound (95 % of parts, 90 % confidence)' })).toBeVisible();
	await expect.poll(() => order(page, all)).toEqual([LOW, HIGH, WIDE]);
	await expect(page.locator(`tr[data-part="${WIDE}"]`)).toContainText('bound');
	// The chooser is one radio group: Tab reaches the chosen basis, arrow keys move the choice.
	const bound = page.getByRole('radio', { name: 'statistical bound' });
	await bound.focus();
	await expect(bound).toBeChecked();
	await page.keyboard.press('ArrowRight');
	await expect(page.getByRole('radio', { name: 'worst measured sample' })).toBeChecked();
	await expect(page.getByRole('heading', { name: 'Ranked by worst measured sample' })).toBeVisible();
	await expect.poll(() => order(page, all)).toEqual([LOW, WIDE, HIGH]);
	await page.keyboard.press('ArrowRight');
	await expect(page.getByRole('heading', { name: 'Ranked by typical (median) sample' })).toBeVisible();
	await expect.poll(() => order(page, all)).toEqual([WIDE, LOW, HIGH]);
	await expect.poll(() => new URL(page.url()).searchParams.get('basis')).toBe('typical');
	await screenshot(page, 'rank-basis-typical-1280');
	// Back on the bound, a stricter coverage is typed as a percentage and stated in the heading.
	await page.keyboard.press('ArrowLeft');
	await page.keyboard.press('ArrowLeft');
	await expect(bound).toBeChecked();
	await page.getByLabel('Fraction of parts the statistical bound covers').fill('99 %');
	await expect(page.getByRole('heading', { name: 'Ranked by statistical bound (99 % of parts, 90 % confidence)' })).toBeVisible();
	await expect.poll(() => new URL(page.url()).searchParams.get('cov')).toBe('0.99');
	await page.getByLabel('Fraction of parts the statistical bound covers').fill('120 %');
	await expect(page.getByText(/coverage must lie between 0\.5 and 0\.999/i)).toBeVisible();

	// The part page of the widely spread part: every sample, the envelope and the bound at the reference conditions.
	await page.goto(`/parts/${ids[2]}`);
	const reference = page.getByTestId('reference-table');
	await expect(reference).toContainText('k 5.311');
	await expect(reference).toContainText('−0.100 V, 25 °C');
	await page.setViewportSize({ width: 390, height: 900 });
	await page.waitForTimeout(300);
	const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
	expect(overflow, 'the part page must not scroll sideways at 390 px').toBeLessThanOrEqual(1);
	await screenshot(page, 'part-samples-390');
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
