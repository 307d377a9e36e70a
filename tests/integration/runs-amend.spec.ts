// Putting stored runs right through the API and the run page: withdraw, put back, fit again
// with a voltage window left out, correct sample or temperature. Each change rebuilds the
// part's model, reaches the ranking through the server's cache and a cache in this process,
// shows on an approved project as "changed since the decision", and deletes nothing.
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import postgres from 'postgres';
import { and, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, fits, partModels, parts, runs, samples } from '$lib/server/db/schema';
import { ModelCache } from '$lib/server/model-cache';
import { predictParts } from '$lib/server/ranking';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { api, browse, tokenFor, unique } from './helpers';
import { forwardCsv } from './catalogue-fixtures';

const client = postgres(process.env.DATABASE_URL!, { max: 2, onnotice: () => {} });
const cache = new ModelCache(client, { rebuildDelayMs: 5 });

beforeAll(async () => {
	await cache.ready();
	await tokenFor('librarian');
});
afterAll(async () => {
	await cache.close();
	await client.end();
});

async function newPart() {
	const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: unique('RW').toUpperCase(), maker: 'Tessaly Devices', kind: 'diode', ratings: { reverseV: 30 } } });
	expect(r.status, JSON.stringify(r.body)).toBe(201);
	return r.body as { id: number; partNumber: string };
}

async function upload(partId: number, sample: string, csv: string, temperatureC = 25) {
	const r = await api('POST', `/api/v1/junctions/${partId}/runs?sample=${sample}&temperatureC=${temperatureC}`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
	expect(r.status, JSON.stringify(r.body)).toBe(201);
	return r.body.id as number;
}

const post = (path: string, json: unknown, as: 'librarian' | 'designer' = 'librarian') => api('POST', path, { as, json });

/** Rows that history is made of, per part: nothing may ever go missing from them. */
async function historyCounts(partId: number) {
	const runRows = await db.select({ id: runs.id, sha: runs.fileSha256 }).from(runs).where(eq(runs.partId, partId));
	const fitRows = await db.select({ id: fits.id }).from(fits).where(eq(fits.partId, partId));
	return { runs: runRows.length, fits: fitRows.length, shas: runRows.map((r) => r.sha).sort() };
}

/** Ranks through the server (its own model cache) until the part's worst leakage is `want` (relative 1e-9). */
async function serverWorst(partNumber: string, want: number): Promise<number> {
	let seen = NaN;
	for (let i = 0; i < 100; i++) {
		const r = await api('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -5, temperatureC: 25, q: partNumber } });
		seen = r.body.items[0]?.leakageA.worst ?? NaN;
		if (Math.abs(seen / want - 1) < 1e-9) return seen;
		await new Promise((res) => setTimeout(res, 100));
	}
	return seen;
}

describe('withdrawing a run', () => {
	test('rebuilds the model without it, in the ranking of both caches and on an approved project; nothing is deleted', async () => {
		const part = await newPart();
		// Two samples, a hundredfold apart in IS; the leaky one dominates the worst case.
		const quiet = await upload(part.id, 'U1', forwardCsv({ IS: 1e-14, N: 1.05, RS: 2 }));
		const leakyCsv = forwardCsv({ IS: 1e-12, N: 1.05, RS: 2 });
		const leaky = await upload(part.id, 'U2', leakyCsv);
		const quietFit = (await api('GET', `/api/v1/junctions/${part.id}/runs/${quiet}`, { as: 'designer' })).body.fit;
		const leakyFit = (await api('GET', `/api/v1/junctions/${part.id}/runs/${leaky}`, { as: 'designer' })).body.fit;
		// Far below −3·N·Vt the Shockley equation gives I = −IS (Shockley 1949; Sze, Physics of
		// Semiconductor Devices, 3rd ed., eq. 2.2): the worst sample's IS is the worst leakage at 25 °C.
		expect((await serverWorst(part.partNumber, leakyFit.model.IS)) / leakyFit.model.IS).toBeCloseTo(1, 9);

		// A designer's project on that part, approved: its snapshot holds the model version it saw.
		const project = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Guarded clamp'), requirement: { biasV: -5, temperatureC: 25, leakageTargetA: 1e-11 } } });
		const pid = project.body.id as number;
		expect((await post(`/api/v1/projects/${pid}/shortlist`, { junctionId: part.id }, 'designer')).status).toBe(201);
		expect((await post(`/api/v1/projects/${pid}/review`, { action: 'submit', comment: '' }, 'designer')).status).toBe(200);
		expect((await api('POST', `/api/v1/projects/${pid}/review`, { as: 'lead', json: { action: 'approve', comment: 'Fine.' } })).status).toBe(200);
		const before = await historyCounts(part.id);
		const [{ modelVersion: versionBefore }] = await db.select({ modelVersion: parts.modelVersion }).from(parts).where(eq(parts.id, part.id));

		const rebuilt = cache.nextRebuild();
		const r = await post(`/api/v1/junctions/${part.id}/runs/${leaky}/withdraw`, { reason: 'Fixture lid was open: light on the die.' });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body).toMatchObject({ id: leaky, state: 'withdrawn', withdrawn: { reason: 'Fixture lid was open: light on the die.' }, modelVersion: versionBefore + 1 });
		expect(r.body.withdrawn.by).toBe('Tobiah Quell');

		// The part's model now comes from U1 alone.
		const [model] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(model.sampleCount).toBe(1);
		expect(model.typical.IS).toBe(quietFit.model.IS);
		// This process's cache heard the announcement; the server's ranking follows.
		await rebuilt;
		const mine = (await predictParts([part.id], { biasV: -5, temperatureC: 25 }, cache)).get(part.id)!;
		expect(mine.leakageA.worst / quietFit.model.IS).toBeCloseTo(1, 9);
		expect(mine.modelVersion).toBe(versionBefore + 1);
		expect((await serverWorst(part.partNumber, quietFit.model.IS)) / quietFit.model.IS).toBeCloseTo(1, 9);

		// The approved project says its predictions changed, with old and new numbers.
		let changed: { junctionId: number; then: { leakageA: { worst: number } }; now: { leakageA: { worst: number } } }[] = [];
		for (let i = 0; i < 100 && changed.length === 0; i++) {
			changed = (await api('GET', `/api/v1/projects/${pid}`, { as: 'designer' })).body.changedSinceDecision;
			if (changed.length === 0) await new Promise((res) => setTimeout(res, 100));
		}
		expect(changed).toHaveLength(1);
		expect(changed[0].then.leakageA.worst / leakyFit.model.IS).toBeCloseTo(1, 9);
		expect(changed[0].now.leakageA.worst / quietFit.model.IS).toBeCloseTo(1, 9);
		const page = await browse(`/projects/${pid}`, { as: 'designer' });
		expect(page.text).toContain('Predictions changed since the decision');

		// History intact: same runs, same files, the fit still on record, the original bytes served.
		expect(await historyCounts(part.id)).toEqual(before);
		const file = await fetch(`${process.env.APP_URL}/parts/${part.id}/runs/${leaky}/file`, { headers: { authorization: `Bearer ${await tokenFor('designer')}` } });
		expect(createHash('sha256').update(await file.text()).digest('hex')).toBe(createHash('sha256').update(leakyCsv).digest('hex'));
		const detail = await api('GET', `/api/v1/junctions/${part.id}/runs/${leaky}`, { as: 'designer' });
		expect(detail.body.fits).toHaveLength(1);
		expect(detail.body.fit.model).toEqual(leakyFit.model);
		expect(detail.body.history.map((h: { action: string }) => h.action)).toEqual(['withdraw', 'ingest']);
		const junction = await api('GET', `/api/v1/junctions/${part.id}`, { as: 'designer' });
		expect(junction.body.runs.find((x: { id: number }) => x.id === leaky)).toMatchObject({ state: 'withdrawn', withdrawn: { reason: 'Fixture lid was open: light on the die.' } });
	});

	test('a second withdrawal, a re-fit and a correction of a withdrawn run are 409; putting it back restores the model', async () => {
		const part = await newPart();
		await upload(part.id, 'U1', forwardCsv({ IS: 2e-14 }));
		const csv = forwardCsv({ IS: 5e-14 });
		const run = await upload(part.id, 'U2', csv);
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		const [modelBefore] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect((await post(`${base}/withdraw`, { reason: 'wrong unit on the fixture' })).status).toBe(200);
		// The same file uploaded again points to the withdrawn run rather than storing a copy.
		const again = await api('POST', `/api/v1/junctions/${part.id}/runs?sample=U2&temperatureC=25`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(again.status).toBe(409);
		expect(again.body.error.message).toMatch(new RegExp(`run ${run} .*later withdrawn`));
		for (const [method, path, json] of [
			['POST', `${base}/withdraw`, { reason: 'again' }],
			['POST', `${base}/refit`, { excludeV: [0.4, 0.5] }],
			['PATCH', base, { temperatureC: 30 }]
		] as const) {
			const r = await api(method, path, { as: 'librarian', json });
			expect(r.status, `${method} ${path}`).toBe(409);
			expect(r.body.error.code).toBe('conflict');
			expect(r.body.error.message).toMatch(/withdrawn/);
		}
		const back = await post(`${base}/reinstate`, { reason: 'The fixture was fine after all.' });
		expect(back.status).toBe(200);
		expect(back.body.state).toBe('active');
		const [modelAfter] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(modelAfter.sampleModels).toEqual(modelBefore.sampleModels);
		expect((await post(`${base}/reinstate`, { reason: 'twice' })).status).toBe(409);
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entity, 'run'), eq(auditLog.entityId, String(run))));
		expect(audits.map((a) => a.action).sort()).toEqual(['run.ingest', 'run.reinstate', 'run.withdraw']);
	});

	test('a reason is required; designers may not; an unknown run is a 404', async () => {
		const part = await newPart();
		const run = await upload(part.id, 'U1', forwardCsv());
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		const none = await post(`${base}/withdraw`, { reason: '  ' });
		expect(none.status).toBe(400);
		expect(none.body.error.issues[0].path).toBe('reason');
		expect((await post(`${base}/withdraw`, { reason: 'x' }, 'designer')).status).toBe(403);
		expect((await post(`/api/v1/junctions/${part.id}/runs/999999/withdraw`, { reason: 'x' })).status).toBe(404);
		// A run of another part is not found under this one.
		const other = await newPart();
		expect((await post(`/api/v1/junctions/${other.id}/runs/${run}/withdraw`, { reason: 'x' })).status).toBe(404);
	});

	test('two librarians withdrawing one run at once: one is recorded, the other gets 409', async () => {
		const part = await newPart();
		await upload(part.id, 'U1', forwardCsv());
		const run = await upload(part.id, 'U2', forwardCsv({ IS: 3e-14 }));
		const second = await people.upsert({ email: `${unique('lib')}@demo.test`, name: 'Second Librarian', roles: ['librarian'] }, null);
		const { token } = await tokens.create(second.id, 'concurrency test', null);
		const withdraw = (headers: Record<string, string>) =>
			api('POST', `/api/v1/junctions/${part.id}/runs/${run}/withdraw`, { json: { reason: `withdrawn by ${headers.who}` }, headers: { authorization: headers.auth } });
		const results = await Promise.all([
			withdraw({ who: 'first', auth: `Bearer ${await tokenFor('librarian')}` }),
			withdraw({ who: 'second', auth: `Bearer ${token}` })
		]);
		expect(results.map((r) => r.status).sort()).toEqual([200, 409]);
		const loser = results.find((r) => r.status === 409)!;
		expect(loser.body.error.message).toMatch(/withdrawn/);
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entity, 'run'), eq(auditLog.entityId, String(run)), eq(auditLog.action, 'run.withdraw')));
		expect(audits).toHaveLength(1);
		const [row] = await db.select().from(runs).where(eq(runs.id, run));
		expect(row.revision).toBe(2);
		expect(row.withdrawnReason).toBe(audits[0].detail.reason);
	});
});

describe('fitting a run again', () => {
	test('leaving out the window where the instrument changed range recovers the generating model; v1 is kept', async () => {
		const part = await newPart();
		// Generated from IS 10 fA, N 1.05, RS 2 Ω; between 0.42 and 0.50 V the meter read 30 % high (a range with the wrong gain).
		const clean = forwardCsv({ IS: 1e-14, N: 1.05, RS: 2, steps: 40 });
		const bent =
			clean
				.trim()
				.split('\n')
				.map((l, k) => {
					const [v, i] = l.split(',').map(Number);
					return k > 0 && v > 0.42 && v < 0.5 ? `${l.split(',')[0]},${(i * 1.3).toPrecision(7)}` : l;
				})
				.join('\n') + '\n';
		const run = await upload(part.id, 'U1', bent);
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		const v1 = (await api('GET', base, { as: 'designer' })).body.fit;
		expect(Math.abs(v1.model.RS - 2)).toBeGreaterThan(0.5); // the bad window drags the fit away
		const before = await historyCounts(part.id);
		const r = await post(`${base}/refit`, { excludeV: [0.42, 0.5], reason: 'meter changed range at 0.42 V' });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body.fit).toMatchObject({ version: 2, cause: 'refit', current: true, excludedV: [0.42, 0.5], note: 'meter changed range at 0.42 V' });
		expect(r.body.fit.model.IS / 1e-14).toBeCloseTo(1, 3);
		expect(r.body.fit.model.N).toBeCloseTo(1.05, 4);
		expect(r.body.fit.model.RS).toBeCloseTo(2, 3);
		// The earlier version is kept, unchanged, and marked as replaced.
		expect(r.body.fits).toHaveLength(2);
		expect(r.body.fits[1]).toMatchObject({ version: 1, current: false, cause: 'upload', model: v1.model });
		expect(r.body.fits[1].supersededAt).not.toBeNull();
		const after = await historyCounts(part.id);
		expect(after).toEqual({ ...before, fits: before.fits + 1 });
		// The part's model follows the new version, in this process's cache too.
		const [model] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(model.typical.RS).toBe(r.body.fit.model.RS);
		const target = r.body.fit.model.IS;
		for (let i = 0; i < 100 && Math.abs(((await predictParts([part.id], { biasV: -5, temperatureC: 25 }, cache)).get(part.id)?.leakageA.worst ?? 0) / target - 1) > 1e-9; i++)
			await new Promise((res) => setTimeout(res, 50));
		expect((await predictParts([part.id], { biasV: -5, temperatureC: 25 }, cache)).get(part.id)!.modelVersion).toBe(r.body.modelVersion);
		expect((await serverWorst(part.partNumber, target)) / target).toBeCloseTo(1, 9);
		// Fitting every point again is a third version equal to the first.
		const all = await post(`${base}/refit`, {});
		expect(all.body.fit.version).toBe(3);
		expect(all.body.fit.excludedV).toBeNull();
		expect(all.body.fit.model.IS).toBeCloseTo(v1.model.IS, 25);
	});

	test('a bad window is a 400 naming it; a window leaving too little to fit is a 422 that writes nothing', async () => {
		const part = await newPart();
		const run = await upload(part.id, 'U1', forwardCsv());
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		const bad = await post(`${base}/refit`, { excludeV: [0.6, 0.4] });
		expect(bad.status).toBe(400);
		expect(bad.body.error.issues[0].path).toBe('excludeV');
		const before = await historyCounts(part.id);
		const everything = await post(`${base}/refit`, { excludeV: [-10, 10] });
		expect(everything.status).toBe(422);
		expect(await historyCounts(part.id)).toEqual(before);
	});
});

describe('correcting a run', () => {
	const points = (csv: string) =>
		csv
			.trim()
			.split('\n')
			.slice(1)
			.map((l) => l.split(',').map(Number))
			.map(([voltageV, currentA]) => ({ voltageV, currentA }));

	test('a temperature typed wrong: a new fit version at the right temperature, recorded as a change', async () => {
		const part = await newPart();
		const up = await api('POST', `/api/v1/junctions/${part.id}/runs`, { as: 'librarian', json: { sample: 'U1', temperatureC: 25, points: points(forwardCsv({ IS: 1e-14, N: 1.05 })) } });
		expect(up.status).toBe(201);
		const base = `/api/v1/junctions/${part.id}/runs/${up.body.id}`;
		const r = await api('PATCH', base, { as: 'librarian', json: { temperatureC: 85, reason: 'the chamber was at 85 °C' } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body).toMatchObject({ temperatureC: 85, sample: 'U1' });
		const [v2, v1] = r.body.fits;
		expect(v2).toMatchObject({ version: 2, cause: 'correction', current: true });
		// The slope fixes N·Vt with Vt = kT/q (SI 2019 exact k and q): N scales as T_before / T_after in kelvin,
		// while the intercept −N·Vt·ln IS, and so IS at the measured temperature, stays.
		expect(v2.model.N / v1.model.N).toBeCloseTo(298.15 / 358.15, 5);
		expect(v2.model.IS / v1.model.IS).toBeCloseTo(1, 5);
		expect(v2.range.temperatureC).toBe(85);
		expect(v1.range.temperatureC).toBe(25);
		const [model] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(model.measured.temperaturesC).toEqual([85]);
		const [audit] = await db.select().from(auditLog).where(and(eq(auditLog.entityId, String(up.body.id)), eq(auditLog.action, 'run.correct')));
		expect(audit.detail).toMatchObject({ from: { temperatureC: 25 }, to: { temperatureC: 85 }, reason: 'the chamber was at 85 °C', fitVersion: 2 });
	});

	test('a sample mislabelled: the run moves to the right sample (made when new); the fit numbers stay', async () => {
		const part = await newPart();
		await upload(part.id, 'U1', forwardCsv({ IS: 1e-14 }));
		const run = await upload(part.id, 'U2', forwardCsv({ IS: 4e-14 }));
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		const r = await api('PATCH', base, { as: 'librarian', json: { sample: 'U3' } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body.sample).toBe('U3');
		expect(r.body.fits[0].model).toEqual(r.body.fits[1].model);
		const units = (await db.select({ unit: samples.unit }).from(samples).where(eq(samples.partId, part.id))).map((s) => s.unit).sort();
		expect(units).toEqual(['U1', 'U2', 'U3']);
		// Moving it onto U1 makes U1 carry two runs at 25 °C: the model has one sample left.
		expect((await api('PATCH', base, { as: 'librarian', json: { sample: 'U1' } })).status).toBe(200);
		const [model] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(model.sampleCount).toBe(1);
	});

	test('nothing to change is a 400; a file that states its own temperature is a 422 naming the column', async () => {
		const part = await newPart();
		const run = await upload(part.id, 'U1', forwardCsv());
		const base = `/api/v1/junctions/${part.id}/runs/${run}`;
		expect((await api('PATCH', base, { as: 'librarian', json: { sample: 'U1', temperatureC: 25 } })).status).toBe(400);
		expect((await api('PATCH', base, { as: 'librarian', json: {} })).status).toBe(400);
		const withColumn = forwardCsv({ header: 'V (V),I (A),T (°C)' })
			.trim()
			.split('\n')
			.map((l, k) => (k === 0 ? l : `${l},25`))
			.join('\n');
		const run2 = await upload(part.id, 'U2', withColumn + '\n');
		const r = await api('PATCH', `/api/v1/junctions/${part.id}/runs/${run2}`, { as: 'librarian', json: { temperatureC: 60 } });
		expect(r.status).toBe(422);
		expect(r.body.error.issues[0]).toMatchObject({ path: 'temperatureC', column: 'T (°C)' });
	});
});

describe('the run page', () => {
	test('a librarian withdraws, fits again and corrects through the forms; refusals name the field', async () => {
		const part = await newPart();
		const run = await upload(part.id, 'U1', forwardCsv({ steps: 40 }));
		const page = `/parts/${part.id}/runs/${run}`;
		const shown = await browse(page, { as: 'designer' });
		expect(shown.status).toBe(200);
		expect(shown.text).toContain('Fit versions');
		expect(shown.text).not.toContain('Withdraw this run');
		expect((await browse(page, { as: 'librarian' })).text).toContain('Withdraw this run');

		const typo = await browse(`${page}?/refit`, { as: 'librarian', form: { fromV: '0.4 V', toV: 'half', reason: '' } });
		expect(typo.status).toBe(400);
		expect(typo.text).toContain('Not read as a voltage: write it like −5 V or 612 mV.');
		const refit = await browse(`${page}?/refit`, { as: 'librarian', form: { fromV: '400m', toV: '0.45 V', reason: 'range change' } });
		expect(refit.status).toBe(200);
		const [current] = await db.select().from(fits).where(and(eq(fits.runId, run), eq(fits.version, 2)));
		expect(current.excludedV).toEqual([0.4, 0.45]);

		const fix = await browse(`${page}?/correct`, { as: 'librarian', form: { sample: 'U1', temperature: '308.15 K', reason: '' } });
		expect(fix.status).toBe(200);
		const [row] = await db.select().from(runs).where(eq(runs.id, run));
		expect(row.temperatureC).toBeCloseTo(35, 10);

		expect((await browse(`${page}?/withdraw`, { as: 'librarian', form: { reason: '' } })).status).toBe(400);
		expect((await browse(`${page}?/withdraw`, { as: 'librarian', form: { reason: 'sweep with the fixture open' } })).status).toBe(200);
		const again = await browse(`${page}?/withdraw`, { as: 'librarian', form: { reason: 'twice' } });
		expect(again.status).toBe(409);
		const after = await browse(page, { as: 'designer' });
		expect(after.text).toContain('sweep with the fixture open');
		expect(after.text).toContain('Withdrawn');
		const partPage = await browse(`/parts/${part.id}`, { as: 'designer' });
		expect(partPage.text).toContain('Withdrawn runs');
	});
});
