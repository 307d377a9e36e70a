// The junction API against the running app and real PostgreSQL: creating parts, uploads in
// all three forms, the duplicate-file refusal, aggregate models and the stateless fit.
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, test } from 'vitest';
import { fitCapacitanceCsv, fitSweepCsv } from '$lib/junction';
import { db } from '$lib/server/db';
import { auditLog, partModels, parts } from '$lib/server/db/schema';
import { api, browse, tokenFor, unique } from './helpers';
import { counts, forwardCsv } from './catalogue-fixtures';
import { DEMO_PARTS } from '../../seed/catalogue/parts';
import type { ManifestEntry } from '../../seed/catalogue/generate';

const newPart = (extra: Record<string, unknown> = {}) => ({ partNumber: unique('TP'), maker: 'Test Fab', kind: 'diode', package: 'SOT-23', ratings: { reverseV: 50, forwardA: 0.1 }, tags: ['test'], ...extra });

// Tokens are created (and audited) once, before any test counts rows.
beforeAll(async () => {
	await tokenFor('librarian');
	await tokenFor('designer');
});

async function createPart(extra: Record<string, unknown> = {}) {
	const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: newPart(extra) });
	expect(r.status, JSON.stringify(r.body)).toBe(201);
	return r.body as { id: number; partNumber: string };
}

describe('parts', () => {
	test('a librarian creates a part: 201 with id at the top level, and one audit row', async () => {
		const before = await counts();
		const body = newPart();
		const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: body });
		expect(r.status).toBe(201);
		expect(r.body.id).toBeTypeOf('number');
		expect(r.body.partNumber).toBe(body.partNumber);
		expect(r.body.ratings).toEqual({ reverseV: 50, forwardA: 0.1, junctionC: null });
		expect(r.body.model).toBeNull();
		const after = await counts();
		expect(after.parts - before.parts).toBe(1);
		expect(after.audit_log - before.audit_log).toBe(1);
		expect(after.part_models).toBe(before.part_models);
	});

	test('the same maker and number twice is a 409 that writes nothing', async () => {
		const p = await createPart();
		const before = await counts();
		const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: p.partNumber, maker: 'Test Fab', kind: 'diode' } });
		expect(r.status).toBe(409);
		expect(r.body.error.message).toMatch(/already in the catalogue/);
		expect(await counts()).toEqual(before);
	});

	test('a model given directly is kept, flagged unmeasured, and gets a part_models row', async () => {
		const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: newPart({ model: { IS: 2e-15, N: 1.03, RS: 4 } }) });
		expect(r.status).toBe(201);
		expect(r.body.givenModel).toMatchObject({ IS: 2e-15, N: 1.03, RS: 4 });
		expect(r.body.model).toMatchObject({ isMeasured: false, sampleCount: 0 });
		expect(r.body.flags.map((f: { code: string }) => f.code)).toContain('unmeasured');
		const [row] = await db.select().from(partModels).where(eq(partModels.partId, r.body.id));
		expect(row.isMeasured).toBe(false);
		expect(row.sampleModels).toHaveLength(1);
		expect(row.typical.IS).toBe(2e-15);
	});

	test('an invalid given model is refused with the parameter named', async () => {
		const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: newPart({ model: { IS: -1, N: 1 } }) });
		expect(r.status).toBe(400);
		expect(JSON.stringify(r.body.error.issues)).toMatch(/IS/);
	});

	test('bad fields are listed by path', async () => {
		const r = await api('POST', '/api/v1/junctions', { as: 'librarian', json: { partNumber: '', maker: 'x', kind: 'triode', ratings: { reverseV: -3 } } });
		expect(r.status).toBe(400);
		const paths = r.body.error.issues.map((i: { path: string }) => i.path);
		expect(paths).toEqual(expect.arrayContaining(['partNumber', 'kind', 'ratings.reverseV']));
	});

	test('a designer may read but not write; anonymous must authenticate', async () => {
		expect((await api('GET', '/api/v1/junctions', { as: 'designer' })).status).toBe(200);
		expect((await api('POST', '/api/v1/junctions', { as: 'designer', json: newPart() })).status).toBe(403);
		expect((await api('GET', '/api/v1/junctions', { as: 'anonymous' })).status).toBe(401);
		const p = await createPart();
		expect((await api('PATCH', `/api/v1/junctions/${p.id}`, { as: 'designer', json: { notes: 'x' } })).status).toBe(403);
		expect((await api('POST', `/api/v1/junctions/${p.id}/runs?sample=U1&temperatureC=25`, { as: 'designer', body: forwardCsv(), headers: { 'content-type': 'text/csv' } })).status).toBe(403);
		expect((await api('POST', '/api/v1/fit', { as: 'designer', json: { points: [] } })).status).toBe(400);
	});

	test('PATCH retires a part and bumps nothing it should not', async () => {
		const p = await createPart();
		const r = await api('PATCH', `/api/v1/junctions/${p.id}`, { as: 'librarian', json: { lifecycle: 'retired', tags: ['Gone', 'gone'] } });
		expect(r.status).toBe(200);
		expect(r.body.lifecycle).toBe('retired');
		expect(r.body.tags).toEqual(['gone']);
		const audits = await db.select().from(auditLog).where(eq(auditLog.entityId, String(p.id)));
		expect(audits.map((a) => a.action)).toEqual(expect.arrayContaining(['part.create', 'part.update']));
	});

	test('listing pages with a cursor and filters by kind and text', async () => {
		const tag = unique('tag').toLowerCase();
		for (let k = 0; k < 3; k++) await createPart({ tags: [tag], kind: 'schottky' });
		const first = await api('GET', `/api/v1/junctions?q=${tag}&limit=2`, { as: 'designer' });
		expect(first.status).toBe(200);
		expect(first.body.items).toHaveLength(2);
		expect(first.body.nextCursor).toBeTypeOf('string');
		const second = await api('GET', `/api/v1/junctions?q=${tag}&limit=2&cursor=${first.body.nextCursor}`, { as: 'designer' });
		expect(second.body.items).toHaveLength(1);
		expect(second.body.nextCursor).toBeNull();
		const ids = [...first.body.items, ...second.body.items].map((i: { id: number }) => i.id);
		expect(new Set(ids).size).toBe(3);
		const none = await api('GET', `/api/v1/junctions?q=${tag}&kind=led`, { as: 'designer' });
		expect(none.body.items).toHaveLength(0);
		expect((await api('GET', '/api/v1/junctions?limit=0', { as: 'designer' })).status).toBe(400);
	});

	test('an unknown part is a 404 in the error shape', async () => {
		const r = await api('GET', '/api/v1/junctions/999999999', { as: 'designer' });
		expect(r.status).toBe(404);
		expect(r.body.error.code).toBe('not_found');
	});
});

describe('runs', () => {
	test('a text/csv upload with a token: 201, run and fit, sample created, model rebuilt in one go', async () => {
		const p = await createPart();
		const before = await counts();
		const csv = forwardCsv({ IS: 3e-15, N: 1.04, RS: 5 });
		const r = await api('POST', `/api/v1/junctions/${p.id}/runs?sample=U1&temperatureC=25&fileName=u1.csv`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(r.status, JSON.stringify(r.body)).toBe(201);
		expect(r.body.id).toBeTypeOf('number');
		expect(r.body.stored).toBe(true);
		// Generated from IS 3 fA, N 1.04, RS 5 Ω without noise: the fit returns them closely.
		expect(r.body.fit.model.IS / 3e-15).toBeGreaterThan(0.97);
		expect(r.body.fit.model.IS / 3e-15).toBeLessThan(1.03);
		expect(r.body.fit.model.N).toBeCloseTo(1.04, 3);
		expect(r.body.fit.model.RS).toBeCloseTo(5, 1);
		const after = await counts();
		expect(after.runs - before.runs).toBe(1);
		expect(after.fits - before.fits).toBe(1);
		expect(after.samples - before.samples).toBe(1);
		expect(after.part_models - before.part_models).toBe(1);
		expect(after.audit_log - before.audit_log).toBe(2); // sample created, run ingested
		const [part] = await db.select().from(parts).where(eq(parts.id, p.id));
		expect(part.modelVersion).toBe(2);
		const d = await api('GET', `/api/v1/junctions/${p.id}`, { as: 'designer' });
		expect(d.body.samples.map((s: { unit: string }) => s.unit)).toEqual(['U1']);
		expect(d.body.runs).toHaveLength(1);
		expect(d.body.model).toMatchObject({ isMeasured: true, sampleCount: 1 });
		expect(d.body.model.measured.reverseMeasured).toBe(false);
		// The original bytes come back byte for byte.
		const file = await fetch(`${process.env.APP_URL}/parts/${p.id}/runs/${r.body.id}/file`, { headers: { authorization: `Bearer ${await tokenFor('designer')}` } });
		expect(file.status).toBe(200);
		expect(await file.text()).toBe(csv);
	});

	test('the same file again is refused with 409 naming the earlier run, and nothing is written', async () => {
		const p = await createPart();
		const csv = forwardCsv({ IS: 7e-15 });
		const first = await api('POST', `/api/v1/junctions/${p.id}/runs?sample=U1&temperatureC=25`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(first.status).toBe(201);
		const before = await counts();
		const again = await api('POST', `/api/v1/junctions/${p.id}/runs?sample=U2&temperatureC=25`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(again.status).toBe(409);
		expect(again.body.error.message).toContain(`run ${first.body.id}`);
		expect(await counts()).toEqual(before);
	});

	test('multipart and JSON uploads work; three samples give a median typical and the leakiest as worst', async () => {
		const p = await createPart();
		const form = new FormData();
		form.set('file', new Blob([forwardCsv({ IS: 1e-15 })], { type: 'text/csv' }), 'a.csv');
		form.set('sample', 'A');
		form.set('temperatureC', '25');
		const m = await api('POST', `/api/v1/junctions/${p.id}/runs`, { as: 'librarian', body: form });
		expect(m.status, JSON.stringify(m.body)).toBe(201);
		expect(m.body.fileName).toBe('a.csv');
		const pts = forwardCsv({ IS: 4e-15 })
			.trim()
			.split('\n')
			.slice(1)
			.map((l) => l.split(',').map(Number))
			.map(([voltageV, currentA]) => ({ voltageV, currentA }));
		const j = await api('POST', `/api/v1/junctions/${p.id}/runs`, { as: 'librarian', json: { sample: 'B', temperatureC: 25, points: pts } });
		expect(j.status, JSON.stringify(j.body)).toBe(201);
		const c = await api('POST', `/api/v1/junctions/${p.id}/runs?sample=C&temperatureC=25`, { as: 'librarian', body: forwardCsv({ IS: 2e-15 }), headers: { 'content-type': 'text/csv' } });
		expect(c.status).toBe(201);
		const [row] = await db.select().from(partModels).where(eq(partModels.partId, p.id));
		expect(row.sampleCount).toBe(3);
		expect(row.typical.IS / 2e-15).toBeCloseTo(1, 1);
		expect(row.worst?.IS ?? 0).toBeCloseTo(Math.max(...row.sampleModels.map((s) => s.IS)), 20);
		expect(row.spread.IS[0]).toBeLessThan(row.spread.IS[1]);
		expect(row.measured.temperaturesC).toEqual([25]);
	});

	test('a dry run fits and returns points but stores nothing', async () => {
		const p = await createPart();
		const before = await counts();
		const r = await api('POST', `/api/v1/junctions/${p.id}/runs?dryRun=1&sample=U1&temperatureC=25`, { as: 'librarian', body: forwardCsv(), headers: { 'content-type': 'text/csv' } });
		expect(r.status).toBe(200);
		expect(r.body.stored).toBe(false);
		expect(r.body.points.length).toBeGreaterThan(10);
		expect(await counts()).toEqual(before);
	});

	test('excluding a voltage range changes the points used', async () => {
		const p = await createPart();
		const csv = forwardCsv();
		const all = await api('POST', `/api/v1/junctions/${p.id}/runs?dryRun=1&sample=U1&temperatureC=25`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		const cut = await api('POST', `/api/v1/junctions/${p.id}/runs?dryRun=1&sample=U1&temperatureC=25&excludeFromV=0.6&excludeToV=2`, { as: 'librarian', body: csv, headers: { 'content-type': 'text/csv' } });
		expect(cut.status).toBe(200);
		expect(cut.body.fit.excludedV).toEqual([0.6, 2]);
		const above = all.body.points.filter((pt: number[]) => pt[0] >= 0.6).length;
		expect(above).toBeGreaterThan(0);
		expect(cut.body.fit.quality.points).toBe(all.body.fit.quality.points - above);
	});
});

describe('demo catalogue files', () => {
	const dir = 'seed/catalogue/files/';
	const manifest = JSON.parse(readFileSync(dir + 'manifest.json', 'utf8')) as ManifestEntry[];

	test('fits stored for uploaded demo files equal the engine fitting the same file directly', async () => {
		// The seed loaded these through the upload path; compare with fitSweepCsv on the bytes.
		const iv = manifest.filter((e) => !('measurement' in e));
		const picks = [iv[0], iv[17], iv[40], iv[iv.length - 1]];
		for (const e of picks) {
			const demo = DEMO_PARTS.find((d) => d.key === e.part)!;
			const [part] = await db.select().from(parts).where(eq(parts.partNumber, demo.partNumber));
			const d = await api('GET', `/api/v1/junctions/${part.id}`, { as: 'designer' });
			const run = d.body.runs.find((r: { fileName: string }) => r.fileName === e.file);
			expect(run, e.file).toBeTruthy();
			// The catalogue's material name as is; EG and XTI are the engine's defaults for it.
			const direct = fitSweepCsv(readFileSync(dir + e.file, 'utf8'), { temperatureC: e.temperatureC, material: part.material });
			expect(run.fit.model.IS).toBe(direct.model.IS);
			expect(run.fit.model.N).toBe(direct.model.N);
			expect(run.fit.model.RS).toBe(direct.model.RS);
			expect(run.fit.quality.rmsResidualV).toBe(direct.quality.rmsResidualV);
		}
	});

	test('C–V fits stored for demo files equal the engine fitting the same file with the recorded stray', async () => {
		const cv = manifest.filter((e) => 'measurement' in e && e.measurement === 'cv');
		for (const e of [cv[0], cv[1], cv[cv.length - 1]]) {
			const demo = DEMO_PARTS.find((d) => d.key === e.part)!;
			const [part] = await db.select().from(parts).where(eq(parts.partNumber, demo.partNumber));
			const run = (await api('GET', `/api/v1/junctions/${part.id}`, { as: 'designer' })).body.runs.find((r: { fileName: string }) => r.fileName === e.file);
			expect(run?.measurement, e.file).toBe('cv');
			const stray = 'strayCapacitanceF' in e ? e.strayCapacitanceF : undefined;
			const direct = fitCapacitanceCsv(readFileSync(dir + e.file, 'utf8'), { temperatureC: e.temperatureC, strayCapacitanceF: stray });
			for (const k of ['CJO', 'VJ', 'M'] as const) expect(run.fit.model[k]).toBe(direct.model[k]);
			expect(run.fit.strayCapacitanceF).toBe(stray ?? 0);
			expect(run.fit.quality.rmsRelative).toBe(direct.quality.rmsRelative);
		}
	});

	test('the stateless fit of a demo file agrees with the engine', async () => {
		const e = manifest.find((m) => m.file.endsWith('_25C.csv'))!;
		const text = readFileSync(dir + e.file, 'utf8');
		const r = await api('POST', '/api/v1/fit?temperatureC=25', { as: 'designer', body: text, headers: { 'content-type': 'text/csv' } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		const direct = fitSweepCsv(text, { temperatureC: 25 });
		expect(r.body.model.IS).toBe(direct.model.IS);
		expect(r.body.interval.N).toEqual(direct.interval.N);
		expect(r.body.quality).toEqual(direct.quality);
		expect(Object.keys(r.body.range)).toEqual(['currentA', 'voltageV', 'temperatureC']);
	});

	test('demo parts with only a card are unmeasured, the others measured', async () => {
		const cardOnly = DEMO_PARTS.find((d) => d.card && d.samples === 0)!;
		const [part] = await db.select().from(parts).where(eq(parts.partNumber, cardOnly.partNumber));
		const [row] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(row).toMatchObject({ isMeasured: false, sampleCount: 0 });
		const measured = DEMO_PARTS.filter((d) => d.samples >= 3).length;
		expect(measured).toBeGreaterThanOrEqual(25);
	});
});

describe('screens', () => {
	test('the part page and the catalogue render for a designer; the upload page refuses them', async () => {
		const [part] = await db.select().from(parts).limit(1);
		const page = await browse(`/parts/${part.id}`, { as: 'designer' });
		expect(page.status).toBe(200);
		expect(page.text).toContain(part.partNumber);
		expect((await browse('/catalogue', { as: 'designer' })).status).toBe(200);
		expect((await browse(`/parts/${part.id}/upload`, { as: 'designer' })).status).toBe(403);
	});

	test('the new-part form keeps values and shows the error beside the field', async () => {
		const before = await counts();
		const r = await browse('/parts/new', { as: 'librarian', form: { partNumber: 'ZZ-1', maker: '', kind: 'diode', reverseV: 'lots' } });
		expect(r.status).toBe(400);
		expect(r.text).toMatch(/Name the maker/);
		expect(r.text).toMatch(/ZZ-1/);
		expect(await counts()).toEqual(before);
	});

	test('the SPICE download reads back through the engine, its numbers to 7 significant digits', async () => {
		const [part] = await db.select().from(parts).limit(1);
		const res = await browse(`/parts/${part.id}/spice`, { as: 'designer' });
		expect(res.status).toBe(200);
		expect(res.text).toMatch(/^\* /);
		const { parseModelCards } = await import('$lib/junction');
		const [card] = parseModelCards(res.text);
		const [row] = await db.select().from(partModels).where(eq(partModels.partId, part.id));
		expect(card.model.IS).toBe(Number(row.typical.IS.toPrecision(7)));
	});
});
