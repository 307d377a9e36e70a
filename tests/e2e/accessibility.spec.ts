// Every screen against WCAG 2.2 level A and AA as axe-core (Deque's open-source engine) checks
// it, signed in as each role that may open it, in each state listed in screens.ts: any serious
// or critical violation fails. The same screens must reflow at 320 CSS px (WCAG 1.4.10) without
// the page scrolling sideways; wide tables scroll inside their own labelled region instead.
import AxeBuilder from '@axe-core/playwright';
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Page } from '@playwright/test';
import { test, expect, sessionFor, noSideScroll } from './fixtures';
import { SCREENS, demoIds, type DemoIds, type Visitor } from './screens';

const WCAG_TAGS = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa'];
const EMAIL: Record<Exclude<Visitor, 'anonymous'>, string> = {
	designer: 'designer@demo.test',
	librarian: 'librarian@demo.test',
	lead: 'lead@demo.test',
	admin: 'admin@demo.test'
};

let ids: DemoIds;

async function pageAs(browser: Browser, who: Visitor): Promise<Page> {
	const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width: 1280, height: 900 } });
	if (who !== 'anonymous') await sessionFor(context, EMAIL[who]);
	return context.newPage();
}

/** The blocking findings, one line each: rule, impact, how many elements, the first few of them. */
async function seriousFindings(page: Page): Promise<string[]> {
	const { violations } = await new AxeBuilder({ page }).withTags(WCAG_TAGS).analyze();
	return violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map((v) => `${v.id} (${v.impact}, ${v.nodes.length}×): ${v.help} — ${v.nodes.slice(0, 4).map((n) => n.target.join(' ')).join(' | ')}`);
}

test.beforeAll(async ({ browser }) => {
	const page = await pageAs(browser, 'designer');
	ids = await demoIds(page.context().request);
	await page.context().close();
});

test('the screen list names every page under src/routes', () => {
	const pages: string[] = [];
	const walk = (dir: string, rel: string) => {
		for (const name of readdirSync(dir)) {
			const full = join(dir, name);
			if (statSync(full).isDirectory()) walk(full, rel ? `${rel}/${name}` : name);
			else if (name === '+page.svelte') pages.push(rel);
		}
	};
	walk('src/routes', '');
	const listed = new Set(SCREENS.map((s) => s.route));
	expect(pages.filter((p) => !listed.has(p)), 'pages with no entry in tests/e2e/screens.ts').toEqual([]);
});

for (const screen of SCREENS) {
	for (const who of screen.roles) {
		const title = `${screen.route || '(start page)'}${screen.state ? `, ${screen.state}` : ''}, as ${who}: no serious or critical WCAG 2.2 AA finding, and it reflows at 320 px`;
		test(title, async ({ browser }) => {
			const page = await pageAs(browser, who);
			const response = await page.goto(screen.path(ids));
			expect(response?.status()).toBe(screen.status ?? 200);
			await page.waitForLoadState('networkidle');
			if (!screen.status) await expect(page.locator('main[data-ready="yes"]')).toBeVisible({ timeout: 30_000 });
			await screen.setup?.(page);
			expect(await seriousFindings(page)).toEqual([]);
			if (!screen.setup) {
				await page.setViewportSize({ width: 320, height: 800 });
				// Charts redraw to the new width on the next frames.
				await expect(() => noSideScroll(page)).toPass({ timeout: 5_000 });
			}
			await page.context().close();
		});
	}
}
