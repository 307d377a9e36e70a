// The node screen in the browser: a designer builds a pair of clamps to ±5 V rails for a ±2 V
// signal, ranks the catalogue in it, reads the net-current chart and the ranked list, and
// saves the node to a new project; how the screen looks at 1280 px and 390 px.
import postgres from 'postgres';
import { test, expect, sessionFor, screenshot } from './fixtures';

const DESIGNER = 'designer@demo.test';

// Two invented parts, three samples each, rated 30 V. In a rails pair at ±5 V with a ±2 V
// signal both clamps are reverse-biased 3 V … 7 V, so each leaks about IS(T) and the two
// nearly cancel; the samples' spread is what is left. QUIET-… has a thousand times the
// smaller IS of LOUD-…, so it ranks first on every basis.
const stamp = Date.now().toString(36);
const QUIET = `QUIET-${stamp}`;
const LOUD = `LOUD-${stamp}`;
let sql: postgres.Sql | null = null;
const ids: number[] = [];

test.beforeAll(async () => {
	sql = postgres(process.env.DATABASE_URL!, { max: 1, onnotice: () => {} });
	const measured = { minCurrentA: 1e-15, temperaturesC: [25, 85], reverseMeasured: true, worstRmsResidualV: 5e-4 };
	for (const [partNumber, IS] of [
		[QUIET, 2e-15],
		[LOUD, 2e-12]
	] as const) {
		const model = { IS, N: 1, RS: 2, TNOM: 27, EG: 1.11, XTI: 3 };
		const [row] = await sql`insert into parts (part_number, maker, kind, package, rated_reverse_v, shunt_factor_per_10k)
			values (${partNumber}, 'Orrin Devices', 'diode', 'SOD-323', 30, 2) returning id`;
		const samples = [model, { ...model, IS: IS * 1.6 }, { ...model, IS: IS * 0.7 }];
		await sql`insert into part_models (part_id, typical, sample_models, measured, sample_count, is_measured, version)
			values (${row.id}, ${sql.json(model)}, ${sql.json(samples)}, ${sql.json(measured)}, 3, true, 1)`;
		await sql`select pg_notify('junction_models', ${String(row.id)})`;
		ids.push(row.id);
	}
});

test.afterAll(async () => {
	if (sql && ids.length) {
		await sql`delete from projects where name like ${`%${stamp}%`}`;
		await sql`delete from parts where id = any(${ids})`;
		for (const id of ids) await sql`select pg_notify('junction_models', ${String(id)})`;
	}
	await sql?.end();
});

test('a designer builds a rails pair, ranks the catalogue in it and saves it to a project', async ({ page, context }) => {
	// A development server on a busy machine may take most of a minute to hydrate the page.
	test.setTimeout(150_000);
	await sessionFor(context, DESIGNER);
	await page.goto('/node');
	await expect(page.locator('[data-live="yes"]')).toBeVisible({ timeout: 90_000 });
	await page.getByRole('link', { name: 'Pair to the rails' }).click();
	// The preset arrives by navigation and replaces the form's fields: type only after it has.
	await page.waitForURL(/preset=rail-pair/);
	await page.waitForLoadState('networkidle');

	// The rails and ranges typed as a designer writes them, SI prefixes and units included.
	await page.getByLabel('Name of rail 1').fill('VPOS');
	await page.getByLabel('Voltage of rail VPOS').fill('+5 V');
	await page.getByLabel('Name of rail 2').fill('VNEG');
	await page.getByLabel('Voltage of rail VNEG').fill('-5 V');
	await page.getByLabel('Signal from').fill('-2 V');
	await page.getByLabel('Signal up to').fill('2');
	await page.getByLabel('Coldest').fill('0 °C');
	await page.getByLabel('Hottest').fill('70 °C');
	await page.getByLabel('Source resistance').fill('1G');
	await page.getByLabel('Fault current').fill('10 mA');
	await page.getByLabel('Name of junction 1').fill('upper');
	await page.getByLabel('Anode of upper').selectOption('node');
	await page.getByLabel('Cathode of upper').selectOption('VPOS');
	await page.getByLabel('Name of junction 2').fill('lower');
	await page.getByLabel('Anode of lower').selectOption('VNEG');
	await page.getByLabel('Cathode of lower').selectOption('node');
	await page.getByRole('searchbox', { name: 'Part or maker' }).fill(stamp);
	await page.getByRole('button', { name: 'Rank candidates' }).click();

	const ranking = page.getByTestId('node-ranking');
	await expect(ranking).toBeVisible();
	await expect(page).toHaveURL(/slo=-2/);
	const rows = ranking.locator('tbody tr');
	await expect(rows).toHaveCount(2);
	expect(await rows.evaluateAll((r) => r.map((x) => x.getAttribute('data-part')))).toEqual([QUIET, LOUD]);
	await expect(ranking.getByRole('heading')).toContainText('statistical bound');
	// The reverse bias the candidates see: rail minus signal at the far end, 5 V − (−2 V).
	await expect(ranking).toContainText('up to 7 V reverse');
	// The chart of the two leading candidates, hot and cold, has drawn its lines.
	const chart = page.getByRole('img', { name: /leading candidates/ }).or(page.locator('canvas[aria-label*="leading candidates"]'));
	await expect(chart.first()).toBeVisible();
	await expect(page.getByText('heavy lines at the hot end')).toBeVisible();
	await screenshot(page, 'node-rank-1280');

	// Ranking by noise keeps the URL shareable.
	await page.getByText('current noise', { exact: true }).click();
	await page.getByRole('button', { name: 'Rank candidates' }).click();
	await expect(page).toHaveURL(/by=noise/);
	await expect(ranking.getByRole('heading')).toContainText('current noise');

	// Saved as a new project's requirement: the project page shows the node.
	const name = `Electrometer input ${stamp}`;
	await page.getByRole('combobox', { name: /^Project/ }).selectOption('new');
	await page.getByLabel('Name of the new project').fill(name);
	await page.getByRole('button', { name: 'Save to the project' }).click();
	await page.waitForURL(/\/projects\/\d+$/);
	await expect(page.getByRole('heading', { name })).toBeVisible();
	await expect(page.getByText('In the protected node')).toBeVisible();
});

test('the ranked node at 390 px: no sideways scroll, the list scrolls in its box', async ({ browser }) => {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width: 390, height: 844 } });
	await sessionFor(context, DESIGNER);
	const page = await context.newPage();
	await page.goto(`/node?rn=VPOS&rv=5&rn=VNEG&rv=-5&slo=-2&shi=2&tlo=0&thi=70&rs=1G&fault=10m&ja=node&jc=VPOS&jp=&jl=upper&ja=VNEG&jc=node&jp=&jl=lower&q=${stamp}`);
	await expect(page.getByTestId('node-ranking').locator('tbody tr')).toHaveCount(2);
	const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
	expect(overflow).toBeLessThanOrEqual(0);
	await screenshot(page, 'node-rank-390');
	await context.close();
});
