import { test, sessionFor } from './fixtures';
const shots: [string, string, string][] = [
	['signin', '', '/signin'],
	['rank', 'designer@demo.test', '/rank?v=-5&tlo=25&thi=85&ic=1m&vf=0.7'],
	['part', 'librarian@demo.test', '/parts/1'],
	['catalogue', 'designer@demo.test', '/catalogue'],
	['admin', 'admin@demo.test', '/admin'],
	['tokens', 'designer@demo.test', '/account/tokens'],
	['node', 'designer@demo.test', '/node'],
	['run', 'librarian@demo.test', '/parts/1/runs/1']
];
for (const [name, who, path] of shots) {
	test(`shot ${name}`, async ({ browser }) => {
		for (const width of [1280, 390]) {
			const context = await browser.newContext({ baseURL: test.info().project.use.baseURL, viewport: { width, height: 900 } });
			if (who) await sessionFor(context, who);
			const page = await context.newPage();
			await page.goto(path);
			await page.waitForLoadState('networkidle');
			await page.waitForTimeout(1200);
			await page.screenshot({ path: `/tmp/i19-shots/${name}-${width}.png`, fullPage: width === 390 ? false : false });
			await context.close();
		}
	});
}
