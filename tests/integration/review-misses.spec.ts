// A requirement stated as an allowed error across a source resistance, and a lead approving
// a shortlist whose parts miss it: refused without a note through the API and the form,
// nothing written; with a note, recorded, mailed and exported as a person reads it.
import { expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, projects, reviewEvents } from '$lib/server/db/schema';
import { api, browse, mailbox, unique } from './helpers';
import { makePart } from './projects-fixtures';

// 1 mV across 1 GΩ allows 1 pA (Ohm's law). At −5 V and 25 °C a junction leaks about its
// saturation current IS (Shockley, reverse bias ≫ N·Vt): 2 fA passes, 5 nA misses by ~5000×.
const REQUIREMENT = { biasV: -5, temperatureC: 25, allowedErrorV: 1e-3, sourceResistanceOhm: 1e9 };

async function predicted(id: number, n: number) {
	for (let i = 0; i < 100; i++) {
		const r = await api('GET', `/api/v1/projects/${id}`, { as: 'designer' });
		if (r.body.entries.length === n && r.body.entries.every((e: { prediction: unknown }) => e.prediction !== null)) return r.body;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error(`project ${id}: predictions never arrived`);
}

test('an allowed error is a leakage budget; approving over misses needs a note, and the note travels', async () => {
	const quiet = await makePart({ model: { IS: 2e-15, N: 1.02, RS: 0.8 } });
	const leaky = await makePart({ model: { IS: 5e-9, N: 1.9, RS: 0.3 } });
	const name = unique('Guarded pH input');
	const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name, requirement: REQUIREMENT } });
	expect(created.status, JSON.stringify(created.body)).toBe(201);
	const id = created.body.id as number;
	expect(created.body.requirement).toEqual(REQUIREMENT);
	for (const p of [quiet, leaky]) expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: p.id } })).status).toBe(201);
	const project = await predicted(id, 2);
	const verdictOf = (partId: number) => project.entries.find((e: { junctionId: number }) => e.junctionId === partId).verdict.leakage;
	expect(verdictOf(quiet.id)).toMatchObject({ status: 'pass', targetA: 1e-12 });
	expect(verdictOf(leaky.id)).toMatchObject({ status: 'fail', targetA: 1e-12 });
	expect((await api('POST', `/api/v1/projects/${id}/review`, { as: 'designer', json: { action: 'submit', comment: '' } })).status).toBe(200);
	const [before] = await db.select().from(projects).where(eq(projects.id, id));

	// Without a note: refused through the API and the form, naming the part that misses; nothing written.
	const bare = await api('POST', `/api/v1/projects/${id}/review`, { as: 'lead', json: { action: 'approve', comment: '  ' } });
	expect(bare.status).toBe(422);
	expect(bare.body.error.message).toBe(`1 of 2 parts miss the requirement (${leaky.partNumber}); approving them needs a note saying why.`);
	expect(bare.body.error.issues).toEqual([expect.objectContaining({ path: 'comment' })]);
	const form = await browse(`/projects/${id}?/review`, { as: 'lead', form: { action: 'approve', comment: '', version: String(before.version) } });
	expect(form.status).toBe(422);
	expect(form.text).toContain('approving them needs a note saying why');
	const [unchanged] = await db.select().from(projects).where(eq(projects.id, id));
	expect(unchanged).toMatchObject({ state: 'in-review', version: before.version });
	expect((await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, id))).map((e) => e.action)).toEqual(['submit']);
	// With a note: approved, the note in the record, the audit row and the designer's mail.
	const note = `${leaky.partNumber} is a second source only.\nThe board uses ${quiet.partNumber}.`;
	const ok = await api('POST', `/api/v1/projects/${id}/review`, { as: 'lead', json: { action: 'approve', comment: note } });
	expect(ok.status, JSON.stringify(ok.body)).toBe(200);
	expect(ok.body.state).toBe('approved');
	const [audit] = await db.select().from(auditLog).where(and(eq(auditLog.entityId, String(id)), eq(auditLog.action, 'review.approve')));
	expect(audit.detail).toMatchObject({ comment: note });
	const mine = await mailbox.waitFor('designer@demo.test', new RegExp(`^Shortlist for “${name}” approved by Marisol Achterberg$`));
	expect(mine.text).toContain(`Marisol Achterberg has approved the shortlist for “${name}”.`);
	expect(mine.text).toContain(`Marisol wrote:\n> ${leaky.partNumber} is a second source only.\n> The board uses ${quiet.partNumber}.`);
	expect(mine.text).toContain('allowed error 1 mV across 1 GΩ (leakage up to 1 pA)');
	expect(mine.text).toMatch(new RegExp(`${leaky.partNumber} \\(Quillmark Semi\\): worst leakage [^;]+; misses: leakage [^ ]+ [^ ]+ is [\\d,]+× the 1 pA allowed`));
	expect(mine.text).not.toMatch(/It is now:|has sent back for changes/);

	// The CSV: kinds as people read them, the budget as the target, short exact numbers.
	const csv = await browse(`/projects/${id}/export/csv`, { as: 'lead' });
	const [head, ...rows] = csv.text.trim().split('\r\n');
	const cols = head.split(',');
	const cell = (row: string, col: string) => row.split(',')[cols.indexOf(col)];
	expect(rows).toHaveLength(2);
	for (const row of rows) {
		expect(cell(row, 'kind')).toBe('PN diode');
		expect(cell(row, 'leakage_target_A')).toBe('1e-12');
		// Seven significant figures at most, in JavaScript's shortest round-trip form.
		for (const col of ['leakage_typical_A', 'leakage_worst_A']) {
			const text = cell(row, col);
			expect(String(Number(text))).toBe(text);
			expect(text.replace(/e.*$/, '').replace(/[-.]/g, '').replace(/^0+/, '').length).toBeLessThanOrEqual(7);
		}
	}
});

test('an allowed error without a source resistance, or beside a leakage target, is refused naming the field', async () => {
	const noR = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('x'), requirement: { biasV: -5, temperatureC: 25, allowedErrorV: 1e-3 } } });
	expect(noR.status).toBe(400);
	expect(noR.body.error.issues).toContainEqual(expect.objectContaining({ path: 'requirement.sourceResistanceOhm', message: 'An allowed error needs the source resistance it appears across.' }));
	const both = await api('POST', '/api/v1/projects', {
		as: 'designer',
		json: { name: unique('x'), requirement: { ...REQUIREMENT, leakageTargetA: 1e-12 } }
	});
	expect(both.status).toBe(400);
	expect(both.body.error.issues).toContainEqual(expect.objectContaining({ path: 'requirement.leakageTargetA', message: 'Give a leakage target or an allowed error, not both.' }));
	const form = await browse('/projects/new', { as: 'designer', form: { name: unique('x'), bias: '-5 V', tempHi: '25', allowedError: '1 mV', sourceR: '' } });
	expect(form.status).toBe(400);
	expect(form.text).toContain('An allowed error needs the source resistance it appears across.');
	expect(form.text).not.toMatch(/sourceResistanceOhm|allowedErrorV/);
});
