/**
 * Every screen of the app, with the roles that may open it and the states worth checking
 * (an open dialog, a refused form, an error page). The accessibility spec visits each one;
 * a new page under src/routes is added here, and the spec fails on a page it does not list.
 */
import type { APIRequestContext, Page } from '@playwright/test';
import { expect, forwardSweep } from './fixtures';
import type { Role } from '../../src/lib/permissions';

export type Visitor = Role | 'anonymous';
export const ANY_ROLE: Role[] = ['designer', 'librarian', 'lead', 'admin'];

/** Records the demo catalogue lends to the screens: found by part number, made by the spec. */
export type DemoIds = { part: number; ivRun: number; cvRun: number; draftProject: number; submittedProject: number };

export type Screen = {
	/** The route file's folder under src/routes (for the check that none is missed). */
	route: string;
	path: (ids: DemoIds) => string;
	roles: Visitor[];
	/** Words for the state, when it is not the page as it opens. */
	state?: string;
	/** Brings the page into that state after it has loaded and hydrated. */
	setup?: (page: Page) => Promise<void>;
	/** The HTTP status the page answers (403 and 404 pages are screens too). */
	status?: number;
};

const RANK_POINT = 'v=-5&tlo=25&thi=85&ic=1m&vf=0.7';

async function openShortlistDialog(page: Page) {
	await page.getByRole('button', { name: /^(Shortlist|Add to project)/ }).first().click();
	await expect(page.getByRole('dialog')).toBeVisible();
	await expect(page.getByRole('dialog')).not.toContainText('Listing your projects');
}

async function openChartNumbers(page: Page) {
	await page.getByText('The numbers behind this chart').first().click();
	await expect(page.getByRole('region', { name: /^Numbers behind the chart/ }).first()).toBeVisible();
}

async function submitEmpty(page: Page, button: RegExp) {
	// Each required field is emptied so the server answers with the form's refusals.
	await page.locator('form[method="POST"] [required]').evaluateAll((els) => els.forEach((el) => el.removeAttribute('required')));
	await page.getByRole('button', { name: button }).click();
	await expect(page.locator('[aria-invalid="true"]').first()).toBeVisible();
}

export const SCREENS: Screen[] = [
	{ route: 'signin', path: () => '/signin', roles: ['anonymous'] },
	{
		route: 'signin',
		path: () => '/signin',
		roles: ['anonymous'],
		state: 'an address refused',
		setup: async (page) => {
			await page.getByLabel('Work e-mail').evaluate((el) => el.setAttribute('type', 'text'));
			await page.getByLabel('Work e-mail').fill('not an address');
			await page.getByRole('button', { name: /sign-in link/i }).click();
			await expect(page.locator('#email-error')).toBeVisible();
		}
	},
	{ route: 'signin', path: () => '/signin?error=Verification', roles: ['anonymous'], state: 'a used link' },
	{ route: 'signin/check-mail', path: () => '/signin/check-mail', roles: ['anonymous'] },
	{ route: 'dev/mailbox', path: () => '/dev/mailbox', roles: ['anonymous'] },
	{ route: '', path: () => '/', roles: ANY_ROLE },
	{ route: 'catalogue', path: () => '/catalogue', roles: ANY_ROLE },
	{
		route: 'catalogue',
		path: () => '/catalogue',
		roles: ['designer'],
		state: 'the columns menu open',
		setup: async (page) => {
			await page.locator('main details > summary').first().click();
		}
	},
	{ route: 'catalogue', path: () => '/catalogue?q=zzzz-nothing-matches', roles: ['designer'], state: 'nothing found' },
	{ route: 'parts/[id=id]', path: (ids) => `/parts/${ids.part}`, roles: ANY_ROLE },
	{ route: 'parts/[id=id]', path: (ids) => `/parts/${ids.part}`, roles: ['designer'], state: 'the shortlist dialog', setup: openShortlistDialog },
	{ route: 'parts/[id=id]', path: (ids) => `/parts/${ids.part}`, roles: ['designer'], state: "a chart's numbers open", setup: openChartNumbers },
	{ route: 'parts/[id=id]', path: () => '/parts/99999999', roles: ['designer'], state: 'a part that is not there', status: 404 },
	{ route: 'parts/[id=id]/runs/[runId=id]', path: (ids) => `/parts/${ids.part}/runs/${ids.ivRun}`, roles: ANY_ROLE, state: 'an I–V run' },
	{ route: 'parts/[id=id]/runs/[runId=id]', path: (ids) => `/parts/${ids.part}/runs/${ids.cvRun}`, roles: ['librarian'], state: 'a C–V run' },
	{ route: 'parts/[id=id]/edit', path: (ids) => `/parts/${ids.part}/edit`, roles: ['librarian'] },
	{ route: 'parts/new', path: () => '/parts/new', roles: ['librarian'] },
	{ route: 'parts/new', path: () => '/parts/new', roles: ['librarian'], state: 'the form refused', setup: (page) => submitEmpty(page, /^(Add|Create|Save)/) },
	{ route: 'parts/new', path: () => '/parts/new', roles: ['designer'], state: 'not open to the role', status: 403 },
	{ route: 'parts/[id=id]/upload', path: (ids) => `/parts/${ids.part}/upload`, roles: ['librarian'] },
	{
		route: 'parts/[id=id]/upload',
		path: (ids) => `/parts/${ids.part}/upload`,
		roles: ['librarian'],
		state: 'a file that is no sweep',
		setup: async (page) => {
			await page.getByTestId('file-input').setInputFiles({ name: 'notes.csv', mimeType: 'text/csv', buffer: Buffer.from('hello,world\nno,numbers\n') });
			await expect(page.getByTestId('intake')).toHaveAttribute('data-phase', /problem|refused/);
		}
	},
	{
		route: 'parts/[id=id]/upload',
		path: (ids) => `/parts/${ids.part}/upload`,
		roles: ['librarian'],
		state: 'a sweep fitted',
		setup: async (page) => {
			await page.getByTestId('file-input').setInputFiles({ name: 'U9_25C.csv', mimeType: 'text/csv', buffer: forwardSweep(3e-15, 1.05, 0.9) });
			await expect(page.getByTestId('intake')).toHaveAttribute('data-phase', 'fitted', { timeout: 30_000 });
		}
	},
	{ route: 'parts/import', path: () => '/parts/import', roles: ['librarian'] },
	{
		route: 'parts/import',
		path: () => '/parts/import',
		roles: ['librarian'],
		state: 'a preview with a problem',
		setup: async (page) => {
			const csv = 'Part number,Maker,Kind\nA11Y-OK-1,Quillmark Semi,diode\nA11Y-BAD-2,Quillmark Semi,resistor\n';
			await page.getByLabel('Parts list').setInputFiles({ name: 'parts.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
			await page.getByRole('button', { name: 'Preview' }).click();
			await expect(page.locator('main table')).toBeVisible();
		}
	},
	{ route: 'parts/import/sweeps', path: () => '/parts/import/sweeps', roles: ['librarian'] },
	{ route: 'rank', path: () => `/rank?${RANK_POINT}`, roles: ANY_ROLE },
	{ route: 'rank', path: () => `/rank?${RANK_POINT}`, roles: ['designer'], state: 'the shortlist dialog', setup: openShortlistDialog },
	{ route: 'rank', path: () => `/rank?${RANK_POINT}`, roles: ['designer'], state: "a chart's numbers open", setup: openChartNumbers },
	{ route: 'rank', path: () => '/rank?v=-5&tlo=0&thi=85&ic=-1m&vf=0.7', roles: ['designer'], state: 'an operating point refused' },
	{ route: 'rank/compare', path: (ids) => `/rank/compare?${RANK_POINT}&ids=${ids.part},${ids.part + 1}`, roles: ANY_ROLE },
	{ route: 'node', path: () => '/node', roles: ANY_ROLE },
	{
		route: 'node',
		path: () => '/node',
		roles: ['designer'],
		state: 'the catalogue ranked in the node',
		setup: async (page) => {
			await page.getByRole('button', { name: 'Rank candidates' }).click();
			await expect(page.locator('main table').first()).toBeVisible({ timeout: 30_000 });
		}
	},
	{ route: 'projects', path: () => '/projects', roles: ANY_ROLE },
	{ route: 'projects/new', path: () => '/projects/new', roles: ['designer'] },
	{ route: 'projects/new', path: () => '/projects/new', roles: ['designer'], state: 'the form refused', setup: (page) => submitEmpty(page, /^Create the project/) },
	{ route: 'projects/[id=id]', path: (ids) => `/projects/${ids.draftProject}`, roles: ANY_ROLE, state: 'a draft' },
	{ route: 'projects/[id=id]', path: (ids) => `/projects/${ids.submittedProject}`, roles: ['lead', 'designer'], state: 'submitted for review' },
	{
		route: 'projects/[id=id]',
		path: (ids) => `/projects/${ids.submittedProject}`,
		roles: ['lead'],
		state: 'approving over misses asks for a note',
		setup: async (page) => {
			await page.getByRole('button', { name: /^Approve/ }).click();
			await expect(page.getByRole('button', { name: 'Approve with these misses' })).toBeVisible();
		}
	},
	{ route: 'projects/[id=id]/export/record', path: (ids) => `/projects/${ids.submittedProject}/export/record`, roles: ['lead'] },
	{ route: 'account/tokens', path: () => '/account/tokens', roles: ANY_ROLE },
	{
		route: 'account/tokens',
		path: () => '/account/tokens',
		roles: ['librarian'],
		state: 'a new token shown',
		setup: async (page) => {
			await page.getByLabel('Name').fill(`a11y bench ${Date.now()}`);
			await page.getByRole('button', { name: 'Create token' }).click();
			await expect(page.getByTestId('new-token')).toBeVisible();
		}
	},
	{ route: 'admin', path: () => '/admin', roles: ['admin'] },
	{
		route: 'admin',
		path: () => '/admin',
		roles: ['admin'],
		state: 'a deactivation to confirm',
		setup: async (page) => {
			await page.getByRole('button', { name: /^Deactivate / }).first().click();
			await expect(page.getByRole('button', { name: 'Deactivate', exact: true })).toBeVisible();
		}
	},
	{ route: 'admin/audit', path: () => '/admin/audit', roles: ['admin'] },
	{ route: 'admin/audit', path: () => '/admin/audit', roles: ['designer'], state: 'not open to the role', status: 403 }
];

/** The demo records the screens open, and two projects of the designer's: a draft and one sent to the lead. */
export async function demoIds(designer: APIRequestContext): Promise<DemoIds> {
	const found = await (await designer.get('/api/v1/junctions?q=HRB-D10&limit=5')).json();
	const part = found.items.find((p: { partNumber: string }) => p.partNumber === 'HRB-D10')?.id as number;
	expect(part, 'the demo part HRB-D10').toBeTruthy();
	const detail = await (await designer.get(`/api/v1/junctions/${part}`)).json();
	const runs = detail.runs as { id: number; measurement: string }[];
	const ivRun = runs.find((r) => r.measurement === 'iv')!.id;
	const cvRun = runs.find((r) => r.measurement === 'cv')!.id;
	const project = async (name: string) => {
		const res = await designer.post('/api/v1/projects', {
			data: { name, requirement: { biasV: -5, temperatureRangeC: [25, 85], clampCurrentA: 1e-3, maxForwardDropV: 0.7, leakageTargetA: 1e-18 } }
		});
		expect(res.status(), await res.text()).toBe(201);
		return (await res.json()).id as number;
	};
	const stamp = Date.now().toString(36);
	const draftProject = await project(`Readable draft ${stamp}`);
	const submittedProject = await project(`Readable review ${stamp}`);
	for (const junctionId of [part, part + 1]) {
		const res = await designer.post(`/api/v1/projects/${submittedProject}/shortlist`, { data: { junctionId, note: 'clamp on the guarded input' } });
		expect(res.ok(), await res.text()).toBe(true);
	}
	const submit = await designer.post(`/api/v1/projects/${submittedProject}/review`, { data: { action: 'submit', comment: 'Ready for a look.' } });
	expect(submit.ok(), await submit.text()).toBe(true);
	return { part, ivRun, cvRun, draftProject, submittedProject };
}
