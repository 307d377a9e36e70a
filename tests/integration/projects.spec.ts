// The whole path from a designer's shortlist to a lead's decision, against the running app
// and the real database: validation, shortlist edits, every review step with its mail,
// snapshot, audit row and version, refusals (403/409), exports, and a model change after
// the decision.
import { describe, expect, test } from 'vitest';
import { and, asc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, mailOutbox, projects, reviewEvents } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { parseModelCards } from '$lib/junction/spice-card';
import { api, browse, mailbox, unique, type ApiResult } from './helpers';
import { changeModel, makePart } from './projects-fixtures';

const REQUIREMENT = { biasV: -5, temperatureRangeC: [0, 85], leakageTargetA: 1e-9, clampCurrentA: 1e-3, maxForwardDropV: 0.8 };

async function newProject(extra: Record<string, unknown> = {}) {
	const r = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Guard ring front end'), requirement: REQUIREMENT, ...extra } });
	expect(r.status, JSON.stringify(r.body)).toBe(201);
	return r.body.id as number;
}

/** Reads the project until every entry has a prediction (the model cache hears of new parts shortly after they commit). */
async function projectWithPredictions(id: number): Promise<ApiResult> {
	for (let i = 0; i < 100; i++) {
		const r = await api('GET', `/api/v1/projects/${id}`, { as: 'designer' });
		if (r.body.entries.every((e: { prediction: unknown }) => e.prediction !== null)) return r;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error(`project ${id}: predictions never arrived`);
}

async function waitForModelVersion(id: number, partId: number, version: number) {
	for (let i = 0; i < 100; i++) {
		const r = await api('GET', `/api/v1/projects/${id}`, { as: 'designer' });
		const e = r.body.entries.find((x: { junctionId: number }) => x.junctionId === partId);
		if (e?.prediction?.modelVersion === version) return r;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error('the model change never reached the app');
}

const review = (id: number, as: 'designer' | 'lead' | 'librarian' | 'admin', json: unknown) => api('POST', `/api/v1/projects/${id}/review`, { as, json });

describe('creating a project', () => {
	test('bad input is refused with the field that is wrong', async () => {
		const r = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: 'x', requirement: { biasV: -5 } } });
		expect(r.status).toBe(400);
		expect(r.body.error.code).toBe('bad_request');
		expect(r.body.error.issues).toContainEqual(expect.objectContaining({ path: 'requirement.temperatureC' }));
		const range = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: 'x', requirement: { biasV: -5, temperatureRangeC: [85, 0] } } });
		expect(range.body.error.issues).toContainEqual(expect.objectContaining({ path: 'requirement.temperatureRangeC' }));
		const lead = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: 'x', leadEmail: 'designer@demo.test', requirement: REQUIREMENT } });
		expect(lead.status).toBe(400);
		expect(lead.body.error.issues).toEqual([expect.objectContaining({ path: 'leadEmail' })]);
	});

	test('the form reads SI prefixes and units, and says which field it could not read', async () => {
		const bad = await browse('/projects/new', { as: 'designer', form: { name: 'Form test', bias: '-5 volts please', tempLo: '85 °C' } });
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Not read as a voltage: write it like −5 V or 612 mV.');
		const name = unique('Electrometer input');
		const ok = await browse('/projects/new', { as: 'designer', form: { name, bias: '−5 V', tempLo: '0 °C', tempHi: '85C', leakageTarget: '10p', clamp: '1m', maxDrop: '650m' } });
		expect(ok.status).toBe(303);
		const id = Number(ok.location?.split('/').pop());
		const [row] = await db.select().from(projects).where(eq(projects.id, id));
		expect(row.name).toBe(name);
		expect(row.requirement).toEqual({ biasV: -5, temperatureRangeC: [0, 85], leakageTargetA: 1e-11, clampCurrentA: 1e-3, maxForwardDropV: 0.65 });
	});

	test('the list and the project are readable by every role; a librarian cannot create one', async () => {
		const id = await newProject();
		const list = await api('GET', '/api/v1/projects', { as: 'librarian' });
		expect(list.body.items.map((p: { id: number }) => p.id)).toContain(id);
		expect((await api('POST', '/api/v1/projects', { as: 'librarian', json: { name: 'x', requirement: REQUIREMENT } })).status).toBe(403);
	});
});

describe('shortlist and review', () => {
	test('the whole flow: shortlist, submit, send back, resubmit, approve, export', async () => {
		const good = await makePart();
		const leaky = await makePart({ model: { IS: 5e-9, N: 1.9, RS: 0.3 } });
		const id = await newProject({ memberEmails: ['librarian@demo.test'] });

		// Shortlist: add both, refuse a duplicate and an unknown part, remove and re-add one.
		expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: good.id, note: 'lowest leakage at 85 °C' } })).status).toBe(201);
		expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: leaky.id } })).status).toBe(201);
		expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: good.id } })).status).toBe(409);
		const unknown = await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: 2_000_000_000 } });
		expect(unknown.status).toBe(422);
		expect(unknown.body.error.issues[0].path).toBe('junctionId');
		expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'lead', json: { junctionId: good.id } })).status).toBe(403);
		expect((await api('DELETE', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: leaky.id } })).status).toBe(204);
		// Added by part number through the page's form.
		const byNumber = await browse(`/projects/${id}?/add`, { as: 'designer', form: { partNumber: leaky.partNumber.toLowerCase(), note: 'cheap fallback' } });
		expect(byNumber.status).toBe(200);
		const noSuch = await browse(`/projects/${id}?/add`, { as: 'designer', form: { partNumber: 'NO-SUCH-PART-42', note: '' } });
		expect(noSuch.status).toBe(422);

		// Live verdicts: the good part meets both limits, the leaky one misses the leakage target.
		const before = await projectWithPredictions(id);
		const byPart = new Map(before.body.entries.map((e: { junctionId: number }) => [e.junctionId, e]));
		const g = byPart.get(good.id) as any;
		const l = byPart.get(leaky.id) as any;
		expect(g.note).toBe('lowest leakage at 85 °C');
		expect(g.addedBy.email).toBe('designer@demo.test');
		expect(g.verdict.leakage.status).toBe('pass');
		expect(g.verdict.leakage.ratio).toBeLessThan(1);
		expect(l.verdict.leakage.status).toBe('fail');
		expect(l.verdict.leakage.ratio).toBeGreaterThan(1);
		expect(l.note).toBe('cheap fallback');
		expect(g.prediction.flags).toContain('reverse-not-measured');

		// Nobody decides a draft; a lead cannot submit; a designer cannot approve.
		expect((await review(id, 'lead', { action: 'approve', comment: '' })).status).toBe(409);
		expect((await review(id, 'lead', { action: 'submit', comment: '' })).status).toBe(403);
		expect((await review(id, 'librarian', { action: 'submit', comment: '' })).status).toBe(403);

		const v0 = before.body.version;
		const submitted = await review(id, 'designer', { action: 'submit', comment: 'Two candidates; the second only if cost forces it.' });
		expect(submitted.status).toBe(200);
		expect(submitted.body).toMatchObject({ state: 'in-review', version: v0 + 1 });
		const toLead = await mailbox.waitFor('lead@demo.test', new RegExp(`“${escape(before.body.name)}” awaits your decision`));
		expect(toLead.text).toContain('Two candidates');
		expect(toLead.text).toMatch(/worst leakage \d+(\.\d+)? [fpn]A/);
		expect(toLead.links).toContain(`${process.env.ORIGIN ?? toLead.links[0].split('/projects')[0]}/projects/${id}`);
		expect(toLead.html).toContain(`/projects/${id}"`);

		// Locked while in review; the submitter cannot decide; a comment is needed to send back.
		expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } })).status).toBe(409);
		expect((await review(id, 'designer', { action: 'approve', comment: '' })).status).toBe(403);
		const noComment = await review(id, 'lead', { action: 'request-changes', comment: '' });
		expect(noComment.status).toBe(400);
		expect(noComment.body.error.issues[0].path).toBe('comment');
		expect((await review(id, 'lead', { action: 'approve', comment: '', expectedVersion: v0 })).status).toBe(409);

		const returned = await review(id, 'lead', { action: 'request-changes', comment: 'Drop the leaky one; it misses the target.' });
		expect(returned.status).toBe(200);
		expect(returned.body.state).toBe('returned');
		const toDesigner = await mailbox.waitFor('designer@demo.test', new RegExp(`“${escape(before.body.name)}”: Marisol Achterberg asks for changes`));
		expect(toDesigner.text).toContain('Drop the leaky one');
		await mailbox.waitFor('librarian@demo.test', new RegExp(`“${escape(before.body.name)}”: Marisol Achterberg asks for changes`));

		// Back to editing: the designer removes the leaky part and resubmits; the lead approves.
		expect((await api('DELETE', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: leaky.id } })).status).toBe(204);
		expect((await review(id, 'designer', { action: 'submit', comment: 'Done.' })).status).toBe(200);
		const approved = await review(id, 'lead', { action: 'approve', comment: 'Approved for the rev B board.' });
		expect(approved.status).toBe(200);
		expect(approved.body.state).toBe('approved');
		expect((await review(id, 'lead', { action: 'reject', comment: 'changed my mind' })).status).toBe(409);
		expect((await review(id, 'designer', { action: 'submit', comment: '' })).status).toBe(409);
		const listed = (await api('GET', '/api/v1/projects?state=approved', { as: 'librarian' })).body.items.find((p: { id: number }) => p.id === id);
		expect(listed).toMatchObject({ state: 'approved', entryCount: 1 });

		// Each step left one event (with a snapshot) and one audit row, versions strictly rising.
		const evts = await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, id)).orderBy(asc(reviewEvents.id));
		expect(evts.map((e) => [e.action, e.fromState, e.toState])).toEqual([
			['submit', 'draft', 'in-review'],
			['request-changes', 'in-review', 'returned'],
			['submit', 'returned', 'in-review'],
			['approve', 'in-review', 'approved']
		]);
		expect(evts.map((e) => e.projectVersion)).toEqual([...evts.map((e) => e.projectVersion)].sort((a, b) => a - b));
		const firstSnap = evts[0].snapshot as any;
		const lastSnap = evts[3].snapshot as any;
		expect(firstSnap.entries.map((e: any) => e.partId).sort()).toEqual([good.id, leaky.id].sort());
		expect(lastSnap.entries.map((e: any) => e.partId)).toEqual([good.id]);
		expect(lastSnap.entries[0]).toMatchObject({ modelVersion: 1, prediction: { leakageA: { worst: g.prediction.leakageA.worst } } });
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entity, 'project'), eq(auditLog.entityId, String(id))));
		expect(audits.filter((a) => a.action.startsWith('review.')).map((a) => a.action).sort()).toEqual(['review.approve', 'review.request-changes', 'review.submit', 'review.submit']);
		expect(audits.filter((a) => a.action === 'shortlist.added')).toHaveLength(3);

		// Exports: SPICE cards that parse back, CSV, and the printable record.
		const lib = await browse(`/projects/${id}/export/spice`, { as: 'librarian' });
		expect(lib.status).toBe(200);
		const cards = parseModelCards(lib.text);
		expect(cards).toHaveLength(1);
		expect(cards[0].model.IS).toBe(2e-15);
		expect(lib.text).toContain('not guarantees');
		expect(lib.text).toContain(`* ${good.partNumber} (${good.maker}, PN diode), model version`);
		const csv = await browse(`/projects/${id}/export/csv`, { as: 'lead' });
		const [head, row, ...rest] = csv.text.trim().split('\r\n');
		expect(head.split(',')).toContain('leakage_worst_A');
		expect(row).toContain(good.partNumber);
		expect(row).toContain('pass');
		expect(rest).toEqual([]);
		const record = await browse(`/projects/${id}/export/record`, { as: 'designer' });
		expect(record.text).toContain('Approved for the rev B board.');
		expect(record.text).toContain('guarding and clean, dry assembly matter');
		expect(record.text).toContain('licensed practice');
		// The record carries each part's parameters and the card the .lib has for it.
		expect(record.text).toContain('Models and SPICE cards as they stood');
		expect(record.text).toContain(`.model ${good.partNumber}`);
		// The library can also be made from each part's worst sample at the requirement's hot end.
		const worstLib = await browse(`/projects/${id}/export/spice?sample=worst`, { as: 'designer' });
		expect(worstLib.status).toBe(200);
		expect(worstLib.text).toMatch(/leaks most at −5\.000 V|leaks most at -5\.000 V|worst sample not available/);
		expect((await browse(`/projects/${id}/export/spice?sample=U1`, { as: 'designer' })).status).toBe(400);

		// A model change afterwards: the decision's snapshot stays, the page shows both.
		const eventBefore = evts[3];
		await changeModel(good.id, { IS: 4e-13, N: 1.3, RS: 0.8 });
		const after = await waitForModelVersion(id, good.id, 2);
		const [eventAfter] = await db.select().from(reviewEvents).where(eq(reviewEvents.id, eventBefore.id));
		expect(eventAfter.snapshot).toEqual(eventBefore.snapshot);
		expect(after.body.changedSinceDecision).toHaveLength(1);
		const change = after.body.changedSinceDecision[0];
		expect(change.then.leakageA.worst).toBe(g.prediction.leakageA.worst);
		expect(change.now.leakageA.worst).toBeGreaterThan(change.then.leakageA.worst);
		const page = await browse(`/projects/${id}`, { as: 'designer' });
		expect(page.text).toContain('Predictions changed since the decision');
		// The export still carries the model as approved.
		expect(parseModelCards((await browse(`/projects/${id}/export/spice`, { as: 'designer' })).text)[0].model.IS).toBe(2e-15);
	});

	test('a named lead decides alone, and nobody decides on their own submission', async () => {
		const other = await people.upsert({ email: `${unique('lead')}@demo.test`, name: 'Tamsin Orrery', roles: ['lead'] }, null);
		const both = await people.upsert({ email: `${unique('both')}@demo.test`, name: 'Ilse Brandvold', roles: ['designer', 'lead'] }, null);
		const otherToken = (await tokens.create(other.id, 'test')).token;
		const bothToken = (await tokens.create(both.id, 'test')).token;
		const as = (t: string) => ({ authorization: `Bearer ${t}` });

		const named = await newProject({ leadEmail: 'lead@demo.test' });
		await api('POST', `/api/v1/projects/${named}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } });
		expect((await review(named, 'designer', { action: 'submit', comment: '' })).status).toBe(200);
		const refused = await api('POST', `/api/v1/projects/${named}/review`, { headers: as(otherToken), json: { action: 'approve', comment: '' } });
		expect(refused.status).toBe(403);
		expect(refused.body.error.message).toMatch(/different lead/);
		// Only the named lead was told.
		const [mail] = await db.select().from(mailOutbox).where(eq(mailOutbox.to, other.email));
		expect(mail).toBeUndefined();

		const open = await newProject();
		await api('POST', `/api/v1/projects/${open}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } });
		expect((await api('POST', `/api/v1/projects/${open}/review`, { headers: as(bothToken), json: { action: 'submit', comment: '' } })).status).toBe(200);
		const own = await api('POST', `/api/v1/projects/${open}/review`, { headers: as(bothToken), json: { action: 'approve', comment: '' } });
		expect(own.status).toBe(403);
		expect(own.body.error.message).toMatch(/own submission/);
		const decline = await api('POST', `/api/v1/projects/${open}/review`, { headers: as(otherToken), json: { action: 'reject', comment: 'Out of scope for this board.' } });
		expect(decline.status).toBe(200);
		expect(decline.body.state).toBe('declined');
		expect((await browse(`/projects/${open}/export/spice`, { as: 'designer' })).status).toBe(409);
	});

	test('an empty shortlist cannot be sent for review, and a failed step writes nothing', async () => {
		const id = await newProject();
		const auditsBefore = await db.select().from(auditLog).where(eq(auditLog.entityId, String(id)));
		const r = await review(id, 'designer', { action: 'submit', comment: '' });
		expect(r.status).toBe(409);
		const [row] = await db.select().from(projects).where(eq(projects.id, id));
		expect(row).toMatchObject({ state: 'draft', version: 1 });
		expect(await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, id))).toEqual([]);
		expect(await db.select().from(auditLog).where(eq(auditLog.entityId, String(id)))).toHaveLength(auditsBefore.length);
	});
});

function escape(s: string) {
	return s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
}
