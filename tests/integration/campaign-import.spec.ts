// A campaign folder of 200 sweep files, 10 of them broken, through the same runner the
// sweep-import page uses: 190 stored, 10 listed with their reasons, nothing half-written.
import { inArray, sql } from 'drizzle-orm';
import { beforeAll, describe, expect, test } from 'vitest';
import { DEFAULT_PATTERN } from '$lib/catalogue/file-pattern';
import { planCampaign, runCampaign, runsUploader, summaryCsv, tally, type CampaignFile } from '$lib/catalogue/campaign';
import { db } from '$lib/server/db';
import { fits, runs, samples } from '$lib/server/db/schema';
import { api, APP_URL, tokenFor, unique } from './helpers';
import { forwardCsv } from './catalogue-fixtures';

let token: string;
beforeAll(async () => {
	token = await tokenFor('librarian');
});

const TEMPS = ['-20C', '25C', '45C', '65C', '358.15K'];

describe('campaign folder import', () => {
	test('200 files with 10 broken: 190 stored, 10 listed with reasons, none half-written', async () => {
		const maker = unique('Camp');
		const numbers = Array.from({ length: 10 }, () => unique('CP'));
		const list = ['Part number,Maker,Kind', ...numbers.map((pn) => `${pn},${maker},diode`)].join('\n');
		const made = await api('POST', '/api/v1/junctions/import', { as: 'librarian', body: list, headers: { 'content-type': 'text/csv' } });
		expect(made.status).toBe(201);
		const ids: number[] = made.body.created;
		const catalogue = numbers.map((pn, k) => ({ id: ids[k], pn, mk: maker }));

		const files = new Map<string, CampaignFile>();
		const add = (path: string, text: string) => files.set(path, { path, bytes: async () => new TextEncoder().encode(text) });
		let n = 0;
		for (const pn of numbers)
			for (const unit of ['U1', 'U2', 'U3', 'U4'])
				for (const t of TEMPS) {
					if (unit === 'U4' && t === '358.15K') continue; // 19 good files per part
					// A different IS in every file keeps each file's SHA-256 its own.
					add(`bench/${pn}_${unit}_${t}${n % 3 === 0 ? '_fwd' : ''}.csv`, forwardCsv({ IS: 1e-14 * (1 + 0.003 * n++) }));
				}
		const broken: [string, string, RegExp][] = [
			[`bench/${numbers[0]}_U9_25C.csv`, 'this is not a sweep\n', /./],
			[`bench/${numbers[1]}_U9_25C.csv`, 'V (V),I (A)\n0.5,abc\n0.6,def\n', /./],
			[`bench/${numbers[2]}_U9_25C.csv`, '', /./],
			[`bench/${numbers[3]}_U9_25C.csv`, 'V (V),I (A)\n0.5,1e-6\n', /./],
			[`bench/NOPE-${numbers[4]}_U1_25C.csv`, forwardCsv(), /no part/],
			[`bench/NOPE-${numbers[5]}_U1_25C.csv`, forwardCsv(), /no part/],
			[`bench/${numbers[6]}_U9_hotC.csv`, forwardCsv(), /does not fit/],
			[`bench/${numbers[7]}_U9_900C.csv`, forwardCsv(), /outside/],
			[`bench/${numbers[8]}_U9.csv`, forwardCsv(), /does not fit/],
			[`bench/notes.txt`, 'bench log\n', /does not fit/]
		];
		for (const [path, text] of broken) add(path, text);
		expect(files.size).toBe(200);

		const plan = planCampaign([...files.keys()], DEFAULT_PATTERN, catalogue);
		const seenStates = new Set<string>();
		const outcomes = await runCampaign(plan, files, runsUploader(APP_URL, { authorization: `Bearer ${token}` }), { concurrency: 3, onChange: (_, o) => seenStates.add(o.state) });
		const t = tally(outcomes);
		const notStored = outcomes.map((o, k) => `${plan[k].path}: ${o.state} ${o.message}`).filter((_, k) => outcomes[k].state !== 'stored');
		expect(t.stored, notStored.join('\n')).toBe(190);
		expect(t.refused + t.skipped).toBe(10);
		expect(t.failed).toBe(0);
		expect(seenStates).toEqual(new Set(['reading', 'uploading', 'stored', 'refused', 'skipped']));
		for (const [path, , reason] of broken) {
			const k = plan.findIndex((p) => p.path === path);
			expect(['refused', 'skipped'], path).toContain(outcomes[k].state);
			expect(outcomes[k].message, path).toMatch(reason);
			expect(outcomes[k].message.length, path).toBeGreaterThan(10);
		}

		// Nothing half-written: 190 runs each with its fit, and no sample without a run (U9 never appears).
		const stored = await db.select({ id: runs.id }).from(runs).where(inArray(runs.partId, ids));
		expect(stored).toHaveLength(190);
		const fitted = await db.select({ runId: fits.runId }).from(fits).where(inArray(fits.partId, ids));
		expect(new Set(fitted.map((f) => f.runId))).toEqual(new Set(stored.map((r) => r.id)));
		const units = await db.select({ unit: samples.unit }).from(samples).where(inArray(samples.partId, ids));
		expect(units).toHaveLength(40);
		expect(units.some((u) => u.unit === 'U9')).toBe(false);
		// 358.15 K in a name is 85 °C (BIPM SI Brochure, 9th ed., 2019, §2.3.1).
		const [hot] = await db.execute<{ n: number }>(sql`select count(*)::int as n from runs where part_id in ${ids} and temperature_c = 85`);
		expect(Number(hot.n)).toBe(30);

		// The summary lists every file with its result and reason.
		const summary = summaryCsv(plan, outcomes).trim().split('\r\n');
		expect(summary).toHaveLength(201);
		expect(summary.filter((l) => l.includes(',stored,'))).toHaveLength(190);

		// The same folder again: every good file is a duplicate by SHA-256, nothing new is stored.
		const again = await runCampaign(plan, files, runsUploader(APP_URL, { authorization: `Bearer ${token}` }), { concurrency: 3 });
		expect(tally(again).duplicate).toBe(190);
		expect(await db.select({ id: runs.id }).from(runs).where(inArray(runs.partId, ids))).toHaveLength(190);
	});
});
