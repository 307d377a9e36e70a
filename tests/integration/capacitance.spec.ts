// Capacitance measured, not copied: C–V sweeps fitted without storing, stored as runs the
// three ways I–V runs are (with the original bytes, SHA-256, sample, temperature, who and
// when), aggregated into the part's capacitance (median over samples), used by the ranking and
// its capacitance limit, and put right by withdrawal, re-fit and correction like any run.
import { createHash } from 'node:crypto';
import { describe, expect, test } from 'vitest';
import { median } from 'simple-statistics';
import { and, desc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, fits, partCapacitance, runs, samples } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import { runNgspiceOp } from '../reference/ngspice';
import { api, unique } from './helpers';
import { cvCsv, depletion, forwardCsv } from './catalogue-fixtures';

const TRUTH = { CJO: 3e-12, VJ: 0.7, M: 0.35 };

async function newPart(extra: Record<string, unknown> = {}) {
	const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: unique('CV').toUpperCase(), maker: 'Quillon Devices', kind: 'diode', ratings: { reverseV: 30 }, ...extra } });
	expect(r.status, JSON.stringify(r.body)).toBe(201);
	return r.body as { id: number; partNumber: string };
}

async function csvRun(partId: number, query: string, csv: string, status = 201) {
	const r = await api('POST', `/api/v1/junctions/${partId}/runs?${query}`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
	expect(r.status, JSON.stringify(r.body)).toBe(status);
	return r.body;
}

const part = (id: number) => api('GET', `/api/v1/junctions/${id}`, { as: 'designer' }).then((r) => r.body);
const rank = (partNumber: string, extra: Record<string, unknown> = {}) =>
	api('POST', '/api/v1/rank', { as: 'designer', json: { biasV: -2, temperatureC: 25, q: partNumber, ...extra } }).then((r) => r.body.items[0]);

/** Waits until the server's ranking shows the part with this capacitance (its cache follows notifications). */
async function rankedCapacitance(partNumber: string, want: number | null): Promise<number | null> {
	let seen: number | null = NaN;
	for (let i = 0; i < 100; i++) {
		seen = (await rank(partNumber))?.capacitanceF ?? null;
		if (want === null ? seen === null : seen !== null && Math.abs(seen / want - 1) < 1e-9) return seen;
		await new Promise((res) => setTimeout(res, 100));
	}
	return seen;
}

describe('POST /api/v1/fit/capacitance', () => {
	test('fits JSON points from the depletion formula back to its parameters, storing nothing', async () => {
		const points = Array.from({ length: 21 }, (_, k) => -10 + k * 0.5).map((v) => ({ voltageV: v, capacitanceF: depletion(TRUTH, v) }));
		const before = await db.$count(runs);
		const r = await api('POST', '/api/v1/fit/capacitance', { as: 'designer', json: { points } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		for (const k of ['CJO', 'VJ', 'M'] as const) {
			expect(r.body.model[k] / TRUTH[k]).toBeCloseTo(1, 6);
			expect(r.body.interval[k][0]).toBeLessThanOrEqual(r.body.model[k]);
			expect(r.body.interval[k][1]).toBeGreaterThanOrEqual(r.body.model[k]);
		}
		expect(r.body.quality).toMatchObject({ points: 21, excluded: 0 });
		expect(r.body.quality.rmsRelative).toBeLessThan(1e-6);
		expect(r.body.range.voltageV).toEqual([-10, 0]);
		expect(r.body.range.capacitanceF[1] / depletion(TRUTH, 0)).toBeCloseTo(1, 9);
		expect(await db.$count(runs)).toBe(before);
	});

	test('reads a CSV body, leaves out points above FC·VJ and subtracts the stray capacitance given', async () => {
		// FC·VJ = 0.35 V with SPICE's FC = 0.5: the three points at 0.4, 0.45 and 0.5 V are left out.
		const csv = cvCsv({ ...TRUTH, from: -9.5, to: 0.5, steps: 200, strayF: 0.3e-12 });
		const r = await api('POST', '/api/v1/fit/capacitance?strayCapacitanceF=0.3p', { as: 'designer', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body.quality.excluded).toBe(3);
		expect(r.body.model.CJO / TRUTH.CJO).toBeCloseTo(1, 5);
		expect(r.body.strayCapacitanceF).toBeCloseTo(0.3e-12, 20);
		expect(r.body.residuals).toHaveLength(r.body.quality.points);
	});

	test('refuses data that cannot support a fit, saying why', async () => {
		const few = [-4, -3, -2, -1].map((v) => ({ voltageV: v, capacitanceF: depletion(TRUTH, v) }));
		const r = await api('POST', '/api/v1/fit/capacitance', { as: 'designer', json: { points: few } });
		expect(r.status).toBe(422);
		expect(r.body.error.message).toMatch(/the fit needs at least 5/);
		const shape = await api('POST', '/api/v1/fit/capacitance', { as: 'designer', json: { points: [{ voltageV: -1, currentA: 1e-12 }] } });
		expect(shape.status).toBe(400);
		expect(shape.body.error.message).toMatch(/voltageV, capacitanceF/);
	});
});

describe('C–V runs stored for a part', () => {
	test('the three ways of sending one are stored like I–V runs, with what the file and the librarian state', async () => {
		const p = await newPart();
		// 1. Multipart, found to be C–V from its header; frequency, level and stray typed with units.
		const fileText = cvCsv({ ...TRUTH, strayF: 0.25e-12 });
		const form = new FormData();
		form.set('file', new Blob([fileText], { type: 'text/csv' }), 'U1_25C_cv.csv');
		form.set('sample', 'U1');
		form.set('temperatureC', '25');
		form.set('frequencyHz', '1 MHz');
		form.set('testLevelV', '30 mV');
		form.set('strayCapacitanceF', '0.25 pF');
		const multi = await api('POST', `/api/v1/junctions/${p.id}/runs`, { as: 'librarian', body: form });
		expect(multi.status, JSON.stringify(multi.body)).toBe(201);
		expect(multi.body).toMatchObject({ measurement: 'cv', sample: 'U1', temperatureC: 25, frequencyHz: 1e6, testLevelV: 0.03, stored: true });
		expect(multi.body.fit.model.CJO / TRUTH.CJO).toBeCloseTo(1, 5);
		expect(multi.body.fit.strayCapacitanceF).toBeCloseTo(0.25e-12, 20);

		// 2. JSON points, said to be C–V by their shape.
		// A few random digits below 1 nV in the first voltage keep the file new to the catalogue on every run.
		const points = Array.from({ length: 15 }, (_, k) => -7 + k * 0.5 - (k === 0 ? Math.random() * 1e-9 : 0)).map((v) => ({ voltageV: v, capacitanceF: depletion({ ...TRUTH, CJO: 3.3e-12 }, v) }));
		const json = await api('POST', `/api/v1/junctions/${p.id}/runs`, { as: 'librarian', json: { sample: 'U2', temperatureC: 25, points, frequencyHz: 1e5 } });
		expect(json.status, JSON.stringify(json.body)).toBe(201);
		expect(json.body).toMatchObject({ measurement: 'cv', frequencyHz: 1e5, testLevelV: null });

		// 3. A CSV body without a header: only the measurement field says it is C–V (volts, farads).
		const bare = await csvRun(p.id, 'sample=U3&temperatureC=25&measurement=cv', cvCsv({ ...TRUTH, CJO: 2.8e-12, header: null }));
		expect(bare.measurement).toBe('cv');
		expect(bare.warnings.some((w: { message: string }) => /farads/.test(w.message))).toBe(true);

		// Stored as sent: the bytes, their SHA-256, the sample, who and when; the audit row says C–V.
		const [row] = await db.select().from(runs).where(eq(runs.id, multi.body.id));
		expect(row.fileBytes.toString('utf8')).toBe(fileText);
		expect(row.fileSha256).toBe(createHash('sha256').update(fileText).digest('hex'));
		expect(row).toMatchObject({ measurement: 'cv', temperatureC: 25, frequencyHz: 1e6, testLevelV: 0.03, fileName: 'U1_25C_cv.csv', state: 'active' });
		expect(row.uploadedBy).toBe((await people.findByEmail('librarian@demo.test'))!.id);
		expect(Date.now() - row.createdAt.getTime()).toBeLessThan(120_000);
		const [s] = await db.select().from(samples).where(eq(samples.id, row.sampleId));
		expect(s.unit).toBe('U1');
		const [fit] = await db.select().from(fits).where(eq(fits.runId, row.id));
		expect(fit.strayCapacitanceF).toBeCloseTo(0.25e-12, 20);
		const [audit] = await db.select().from(auditLog).where(and(eq(auditLog.entity, 'run'), eq(auditLog.entityId, String(row.id)))).orderBy(desc(auditLog.id));
		expect(audit.action).toBe('run.ingest');
		expect(audit.detail).toMatchObject({ measurement: 'cv', frequencyHz: 1e6, strayCapacitanceF: 0.25e-12 });

		// The part's capacitance: the median of each parameter over the three samples (simple-statistics' median as the oracle).
		const d = await part(p.id);
		const cvRuns = d.runs.filter((r: { measurement: string }) => r.measurement === 'cv');
		expect(cvRuns).toHaveLength(3);
		expect(d.capacitance.source).toBe('measured');
		expect(d.capacitance.sampleCount).toBe(3);
		for (const k of ['CJO', 'VJ', 'M'] as const) {
			const vals = cvRuns.map((r: { fit: { model: Record<string, number> } }) => r.fit.model[k]);
			expect(d.capacitance.typical[k]).toBeCloseTo(median(vals), 15);
			expect(d.capacitance.spread[k]).toEqual([Math.min(...vals), Math.max(...vals)]);
		}
		// Without an I–V run or a card there is no leakage model: the part is not ranked, but its capacitance is kept.
		expect(d.model).toBeNull();
		const [stored] = await db.select().from(partCapacitance).where(eq(partCapacitance.partId, p.id));
		expect(stored.source).toBe('measured');
	});

	test('the ranking and its capacitance limit use the measured capacitance, at the bias asked for', async () => {
		const p = await newPart();
		await csvRun(p.id, 'sample=U1&temperatureC=25', forwardCsv());
		await csvRun(p.id, 'sample=U1&temperatureC=25', cvCsv({ ...TRUTH }));
		const u2 = await csvRun(p.id, 'sample=U2&temperatureC=25', cvCsv({ ...TRUTH, CJO: 4e-12 }));
		const d = await part(p.id);
		const cap = d.capacitance.typical;
		expect(cap.CJO / 3.5e-12).toBeCloseTo(1, 5); // the median of two samples is their mean
		// The I–V fit's TNOM is 25 °C, the C–V runs' too: no temperature scaling between them.
		expect(d.model.typical.TNOM).toBe(25);
		const want = depletion(cap, -2);
		expect(await rankedCapacitance(p.partNumber, want)).toBeCloseTo(want, 20);
		expect((await rank(p.partNumber, { maxCapacitanceF: 0.9 * want })).flags).toContain('over-capacitance-limit');
		expect((await rank(p.partNumber, { maxCapacitanceF: 1.1 * want })).flags).not.toContain('over-capacitance-limit');

		// Withdrawn, the second sample leaves the median: the first sample's fit alone remains.
		const w = await api('POST', `/api/v1/junctions/${p.id}/runs/${u2.id}/withdraw`, { as: 'librarian', json: { reason: 'fixture left open' } });
		expect(w.status, JSON.stringify(w.body)).toBe(200);
		const after = await part(p.id);
		expect(after.capacitance.sampleCount).toBe(1);
		expect(after.capacitance.typical.CJO / TRUTH.CJO).toBeCloseTo(1, 5);
		const alone = depletion(after.capacitance.typical, -2);
		expect(await rankedCapacitance(p.partNumber, alone)).toBeCloseTo(alone, 20);
	});

	test('the SPICE card of a part carries the measured CJO, VJ and M: ngspice gives the capacitance the ranking shows', async () => {
		const p = await newPart();
		await csvRun(p.id, 'sample=U1&temperatureC=25', forwardCsv());
		await csvRun(p.id, 'sample=U1&temperatureC=25', cvCsv({ ...TRUTH }));
		await csvRun(p.id, 'sample=U2&temperatureC=25', cvCsv({ ...TRUTH, CJO: 3.6e-12, M: 0.38 }));
		const cap = (await part(p.id)).capacitance.typical;
		const want = depletion(cap, -2);
		expect(await rankedCapacitance(p.partNumber, want)).toBeCloseTo(want, 20);
		const card = await api('GET', `/api/v1/junctions/${p.id}/spice`, { as: 'designer' });
		expect(card.status).toBe(200);
		const text = card.body as string;
		expect(text).toMatch(/CJO=/);
		// The block is a `.subckt NAME anode cathode` around its diode D1, or a plain diode `.model`.
		const sub = /^\.subckt\s+(\S+)/im.exec(text)?.[1];
		const model = /^\.model\s+(\S+)\s+D/im.exec(text)?.[1];
		expect(sub ?? model, text).toBeTruthy();
		const [device, probe] = sub ? [`x1 a 0 ${sub}`, '@d.x1.d1[cd]'] : [`d1 a 0 ${model}`, '@d1[cd]'];
		// ngspice 39's junction capacitance (@d[cd], depletion part: TT = 0) at −2 V and the card's
		// own TNOM of 25 °C, so no temperature scaling: the card's digits are all that can differ.
		const ng = runNgspiceOp({ netlist: [text, '.temp 25', 'v1 a 0 dc -2', device].join('\n'), prints: [probe] });
		expect(Math.abs((ng.get(probe) as number) / want - 1)).toBeLessThan(1e-6);
	});

	test('a re-fit may change the stray capacitance, a correction the sample; each is a new fit version', async () => {
		const p = await newPart();
		const run = await csvRun(p.id, 'sample=U1&temperatureC=25', cvCsv({ ...TRUTH, strayF: 0.5e-12 }));
		// Fitted with the fixture's 0.5 pF still in, the junction looks larger and flatter than it is.
		expect(run.fit.model.CJO / TRUTH.CJO).toBeGreaterThan(1.1);
		const refit = await api('POST', `/api/v1/junctions/${p.id}/runs/${run.id}/refit`, { as: 'librarian', json: { strayCapacitanceF: 0.5e-12, reason: 'open fixture measured 0.5 pF' } });
		expect(refit.status, JSON.stringify(refit.body)).toBe(200);
		expect(refit.body.fit).toMatchObject({ version: 2, strayCapacitanceF: 0.5e-12, cause: 'refit' });
		expect(refit.body.fit.model.CJO / TRUTH.CJO).toBeCloseTo(1, 5);
		expect((await part(p.id)).capacitance.typical.CJO / TRUTH.CJO).toBeCloseTo(1, 5);
		const moved = await api('PATCH', `/api/v1/junctions/${p.id}/runs/${run.id}`, { as: 'librarian', json: { sample: 'U7', reason: 'labels swapped' } });
		expect(moved.status, JSON.stringify(moved.body)).toBe(200);
		expect(moved.body).toMatchObject({ sample: 'U7', measurement: 'cv' });
		expect(moved.body.fit).toMatchObject({ version: 3, strayCapacitanceF: 0.5e-12 });
		expect((await part(p.id)).capacitance.samples.map((s: { unit: string }) => s.unit)).toEqual(['U7']);
		// I–V runs have no stray capacitance to change.
		const iv = await csvRun(p.id, 'sample=U1&temperatureC=25', forwardCsv());
		const bad = await api('POST', `/api/v1/junctions/${p.id}/runs/${iv.id}/refit`, { as: 'librarian', json: { strayCapacitanceF: 1e-13 } });
		expect(bad.status).toBe(400);
	});

	test('a card gives the capacitance until a C–V run is measured, and the part says so', async () => {
		const p = await newPart({ model: { IS: 2e-15, N: 1.02, CJO: 5e-12, VJ: 0.8, M: 0.4 } });
		await csvRun(p.id, 'sample=U1&temperatureC=25', forwardCsv({ IS: 2e-15, N: 1.02 }));
		const carded = await part(p.id);
		expect(carded.capacitance).toMatchObject({ source: 'given', typical: { CJO: 5e-12, VJ: 0.8, M: 0.4, FC: 0.5 } });
		expect(carded.flags.map((f: { code: string }) => f.code)).toContain('capacitance-from-card');
		// The measured I–V model carries the card's capacitance (the fit itself has none), moved from
		// the card's TNOM (27 °C, SPICE's default) to the fit's 25 °C by SPICE's CJO scaling: under 1 %.
		expect(Math.abs(carded.model.typical.CJO / 5e-12 - 1)).toBeLessThan(0.01);
		expect(carded.model.typical.TNOM).toBe(25);
		// The ranking shows the card's capacitance and says where it came from.
		const fromCard = depletion(carded.model.typical, -2);
		expect(await rankedCapacitance(p.partNumber, fromCard)).toBeCloseTo(fromCard, 20);
		expect((await rank(p.partNumber)).flags).toContain('capacitance-from-card');
		await csvRun(p.id, 'sample=U1&temperatureC=25', cvCsv({ ...TRUTH }));
		const measured = await part(p.id);
		expect(measured.capacitance.source).toBe('measured');
		expect(measured.flags.map((f: { code: string }) => f.code)).not.toContain('capacitance-from-card');
		expect(await rankedCapacitance(p.partNumber, depletion(measured.capacitance.typical, -2))).toBeCloseTo(depletion(measured.capacitance.typical, -2), 20);
		expect((await rank(p.partNumber)).flags).not.toContain('capacitance-from-card');
	});

	test('a C–V file sent as an I–V sweep is refused with the way to send it, writing nothing', async () => {
		const p = await newPart();
		const r = await csvRun(p.id, 'sample=U1&temperatureC=25&measurement=iv', cvCsv(), 422);
		expect(r.error.message).toMatch(/send the file as a C–V sweep/);
		expect((await part(p.id)).runs).toHaveLength(0);
	});
});
