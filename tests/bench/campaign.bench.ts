/**
 * campaign-500-files-s: a campaign folder of 500 sweep files through the sweep-import
 * runner (three uploads in flight, as the page runs it) against the same 500 files' worth of
 * single uploads one after another, as a librarian would send them from each part's page
 * (ratio = campaign time / single uploads' time; target ≤ 1). Each side gets its own 10 new
 * parts and its own files, so no upload is a duplicate. The detail adds the median
 * GET /api/v1/health latency while the campaign runs, to show the server still answers.
 * Needs DATABASE_URL and APP_URL.
 */
import { planCampaign, runCampaign, runsUploader, tally, type CampaignFile } from '../../src/lib/catalogue/campaign';
import { DEFAULT_PATTERN } from '../../src/lib/catalogue/file-pattern';
import { record } from './results';

const APP_URL = process.env.APP_URL ?? 'http://127.0.0.1:3200';
const VT25 = 0.025693; // kT/q at 25 °C [V]
const FILES = 500;

function sweep(n: number): string {
	const IS = 1e-14 * (1 + 0.0007 * n);
	const rows = ['V (V),I (A)'];
	for (let k = 0; k <= 30; k++) {
		const i = 1e-9 * 1e6 ** (k / 30);
		rows.push(`${(1.04 * VT25 * Math.log(i / IS + 1) + 3 * i).toPrecision(8)},${i.toPrecision(7)}`);
	}
	return rows.join('\n') + '\n';
}

async function newParts(token: string, tag: string) {
	const numbers = Array.from({ length: 10 }, (_, k) => `BENCH-${tag}-${k}`);
	const list = ['Part number,Maker,Kind', ...numbers.map((pn) => `${pn},Bench Campaign Works,diode`)].join('\n');
	const res = await fetch(`${APP_URL}/api/v1/junctions/import`, { method: 'POST', body: list, headers: { 'content-type': 'text/csv', authorization: `Bearer ${token}` } });
	const body = (await res.json()) as { created: number[] };
	return numbers.map((pn, k) => ({ id: body.created[k], pn, mk: 'Bench Campaign Works' }));
}

function folder(parts: { pn: string }[], offset: number): Map<string, CampaignFile> {
	const files = new Map<string, CampaignFile>();
	for (let n = 0; n < FILES; n++) {
		const p = parts[n % 10];
		const path = `${p.pn}_U${Math.floor(n / 10) % 10}_${25 + Math.floor(n / 100) * 10}C.csv`;
		const text = sweep(offset + n);
		files.set(path, { path, bytes: async () => new TextEncoder().encode(text) });
	}
	return files;
}

export async function runCampaignBenchmark() {
	const people = await import('../../src/lib/server/people');
	const tokens = await import('../../src/lib/server/tokens');
	const librarian = await people.findByEmail('librarian@demo.test');
	if (!librarian) return console.log('campaign-500-files-s skipped: no demo librarian');
	const { token } = await tokens.create(librarian.id, 'campaign benchmark', null);
	const auth = { authorization: `Bearer ${token}` };
	const tag = Date.now().toString(36).toUpperCase();

	// Baseline: 500 single uploads, one after the other.
	const singleParts = await newParts(token, `${tag}-S`);
	const singles = folder(singleParts, 0);
	const singlePlan = planCampaign([...singles.keys()], DEFAULT_PATTERN, singleParts);
	let t0 = performance.now();
	const singleOut = await runCampaign(singlePlan, singles, runsUploader(APP_URL, auth), { concurrency: 1 });
	const singleS = (performance.now() - t0) / 1000;

	// The campaign: the runner as the page drives it, with health probes alongside.
	const campParts = await newParts(token, `${tag}-C`);
	const camp = folder(campParts, FILES);
	const campPlan = planCampaign([...camp.keys()], DEFAULT_PATTERN, campParts);
	const probes: number[] = [];
	let running = true;
	const probe = (async () => {
		while (running) {
			const p0 = performance.now();
			await fetch(`${APP_URL}/api/v1/health`);
			probes.push(performance.now() - p0);
			await new Promise((r) => setTimeout(r, 100));
		}
	})();
	t0 = performance.now();
	const campOut = await runCampaign(campPlan, camp, runsUploader(APP_URL, auth), { concurrency: 3 });
	const campS = (performance.now() - t0) / 1000;
	running = false;
	await probe;
	const sorted = [...probes].sort((a, b) => a - b);
	const healthMs = sorted[sorted.length >> 1] ?? NaN;
	const detail = `campaign ${campS.toFixed(1)} s (${tally(campOut).stored} of ${FILES} stored) vs ${FILES} single uploads ${singleS.toFixed(1)} s (${tally(singleOut).stored} stored); health p50 during the campaign ${healthMs.toFixed(1)} ms`;
	console.log(`campaign-500-files-s: ${detail}`);
	record('campaign-500-files-s', campS / singleS, 1, detail);
}

if (import.meta.url === `file://${process.argv[1]}`) {
	await runCampaignBenchmark();
	const { client } = await import('../../src/lib/server/db');
	await client.end();
}
