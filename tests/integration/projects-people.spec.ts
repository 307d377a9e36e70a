// A project's people change, also while its review is open: members removed, the lead
// changed, each with its audit row and mail; an open review always keeps someone to decide.
import { describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, mailOutbox, projectMembers, projects } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { api, browse, personFor, unique } from './helpers';
import { makePart } from './projects-fixtures';

async function openReview(extra: Record<string, unknown> = {}) {
	const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Ion meter input'), requirement: { biasV: -1, temperatureC: 40 }, ...extra } });
	expect(created.status, JSON.stringify(created.body)).toBe(201);
	const id = created.body.id as number;
	await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } });
	expect((await api('POST', `/api/v1/projects/${id}/review`, { as: 'designer', json: { action: 'submit', comment: '' } })).status).toBe(200);
	return id;
}

const mailsTo = async (to: string, projectId: number) => {
	const [p] = await db.select({ name: projects.name }).from(projects).where(eq(projects.id, projectId));
	return (await db.select().from(mailOutbox).where(eq(mailOutbox.to, to))).filter((m) => m.subject.includes(p.name) || m.text.includes(p.name));
};

async function someone(roles: ('designer' | 'lead')[], name: string) {
	const p = await people.upsert({ email: `${unique(name.split(' ')[0].toLowerCase())}@demo.test`, name, roles }, null);
	return { ...p, token: (await tokens.create(p.id, 'people test', null)).token };
}

describe('removing a member', () => {
	test('through the API: 204, an audit row, a mail to the person removed, gone from the list', async () => {
		const extra = await someone(['designer'], 'Ilse Marchbank');
		const id = await openReview({ memberEmails: [extra.email] });
		const r = await api('DELETE', `/api/v1/projects/${id}/members`, { as: 'lead', json: { email: extra.email } });
		expect(r.status, JSON.stringify(r.body)).toBe(204);
		const members = (await api('GET', `/api/v1/projects/${id}`, { as: 'designer' })).body.members.map((m: { email: string }) => m.email);
		expect(members).not.toContain(extra.email);
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entityId, String(id)), eq(auditLog.action, 'project.member-removed')));
		expect(audits).toHaveLength(1);
		expect(audits[0].detail).toMatchObject({ email: extra.email, wasLead: false });
		const mails = await mailsTo(extra.email, id);
		expect(mails).toHaveLength(1);
		expect(mails[0].text).toContain('Marisol Achterberg has removed you');
		// Twice is a 404: they are no longer a member.
		expect((await api('DELETE', `/api/v1/projects/${id}/members`, { as: 'lead', json: { email: extra.email } })).status).toBe(404);
		// And they can be added back.
		expect((await api('POST', `/api/v1/projects/${id}/members`, { as: 'designer', json: { email: extra.email } })).status).toBe(201);
	});

	test('the last person who could decide an open review cannot be removed (409); with another lead they can', async () => {
		// A lead who is also the only other lead-capable person: the submitter is a designer-lead.
		const submitterLead = await someone(['designer', 'lead'], 'Anselm Rook');
		const namedLead = await someone(['lead'], 'Greta Valcourt');
		const created = await api('POST', '/api/v1/projects', { json: { name: unique('Electrometer'), requirement: { biasV: -1, temperatureC: 25 }, leadEmail: namedLead.email }, headers: { authorization: `Bearer ${submitterLead.token}` } });
		const id = created.body.id as number;
		await db.insert(projectMembers).values({ projectId: id, userId: namedLead.id }).onConflictDoNothing();
		await api('POST', `/api/v1/projects/${id}/shortlist`, { json: { junctionId: (await makePart()).id }, headers: { authorization: `Bearer ${submitterLead.token}` } });
		expect((await api('POST', `/api/v1/projects/${id}/review`, { json: { action: 'submit', comment: '' }, headers: { authorization: `Bearer ${submitterLead.token}` } })).status).toBe(200);
		// The demo's lead can still decide, so removing the named lead hands the decision to any lead.
		expect((await people.listWithRole('lead')).map((l) => l.email)).toContain('lead@demo.test');
		expect((await api('DELETE', `/api/v1/projects/${id}/members`, { as: 'designer', json: { email: namedLead.email } })).status).toBe(204);
		const [p] = await db.select().from(projects).where(eq(projects.id, id));
		expect(p.leadId).toBeNull();
		// The pure rule is exercised with "nobody else" in src/lib/project-people.spec.ts; here the
		// database path: the only possible decider named, no other lead in the team.
		const lonely = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Pico clamp'), requirement: { biasV: -1, temperatureC: 25 }, leadEmail: 'lead@demo.test' } });
		const lid = lonely.body.id as number;
		await db.insert(projectMembers).values({ projectId: lid, userId: (await personFor('lead')).id }).onConflictDoNothing();
		await api('POST', `/api/v1/projects/${lid}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } });
		expect((await api('POST', `/api/v1/projects/${lid}/review`, { as: 'designer', json: { action: 'submit', comment: '' } })).status).toBe(200);
		// Take the lead role from everyone else for the moment of the check, then give it back.
		const others = (await people.listWithRole('lead')).filter((l) => l.email !== 'lead@demo.test');
		const admin = await personFor('admin');
		for (const o of others) await people.setRole(o.id, 'lead', false, admin.id);
		try {
			const refused = await api('DELETE', `/api/v1/projects/${lid}/members`, { as: 'designer', json: { email: 'lead@demo.test' } });
			expect(refused.status).toBe(409);
			expect(refused.body.error.message).toMatch(/last person who could decide/);
			const still = await db.select().from(projectMembers).where(and(eq(projectMembers.projectId, lid), eq(projectMembers.userId, (await personFor('lead')).id)));
			expect(still).toHaveLength(1);
		} finally {
			for (const o of others) await people.setRole(o.id, 'lead', true, admin.id);
		}
	});
});

describe('changing the lead', () => {
	test('while the review is open: the new lead is named, mailed, and decides; the old one no longer can', async () => {
		const newLead = await someone(['lead'], 'Perpetua Holm');
		const id = await openReview({ leadEmail: 'lead@demo.test' });
		const [before] = await db.select().from(projects).where(eq(projects.id, id));
		const r = await api('PATCH', `/api/v1/projects/${id}`, { as: 'designer', json: { leadEmail: newLead.email } });
		expect(r.status, JSON.stringify(r.body)).toBe(200);
		expect(r.body.leadId).toBe(newLead.id);
		expect(r.body.version).toBe(before.version + 1);
		expect(r.body.members.map((m: { email: string }) => m.email)).toContain(newLead.email);
		const named = await mailsTo(newLead.email, id);
		expect(named).toHaveLength(1);
		expect(named[0].text).toContain('awaits your decision');
		expect(await mailsTo('lead@demo.test', id)).toEqual(expect.arrayContaining([expect.objectContaining({ subject: expect.stringContaining('is now decided by Perpetua Holm') })]));
		const audits = await db.select().from(auditLog).where(and(eq(auditLog.entityId, String(id)), eq(auditLog.action, 'project.lead-changed')));
		expect(audits[0].detail).toMatchObject({ from: 'lead@demo.test', to: newLead.email });
		// The former lead is refused; the new one decides.
		expect((await api('POST', `/api/v1/projects/${id}/review`, { as: 'lead', json: { action: 'approve', comment: '' } })).status).toBe(403);
		const decided = await api('POST', `/api/v1/projects/${id}/review`, { json: { action: 'approve', comment: 'ok' }, headers: { authorization: `Bearer ${newLead.token}` } });
		expect(decided.status).toBe(200);
	});

	test('refusals: not a lead (422), the same lead (409), the submitter of the open review (409), a designer-only caller allowed, a librarian not', async () => {
		const submitterLead = await someone(['designer', 'lead'], 'Rasmus Ode');
		const created = await api('POST', '/api/v1/projects', { json: { name: unique('Sample-hold'), requirement: { biasV: -1, temperatureC: 25 } }, headers: { authorization: `Bearer ${submitterLead.token}` } });
		const id = created.body.id as number;
		await api('POST', `/api/v1/projects/${id}/shortlist`, { json: { junctionId: (await makePart()).id }, headers: { authorization: `Bearer ${submitterLead.token}` } });
		await api('POST', `/api/v1/projects/${id}/review`, { json: { action: 'submit', comment: '' }, headers: { authorization: `Bearer ${submitterLead.token}` } });
		const notLead = await api('PATCH', `/api/v1/projects/${id}`, { as: 'designer', json: { leadEmail: 'designer@demo.test' } });
		expect(notLead.status).toBe(422);
		expect(notLead.body.error.issues[0].path).toBe('leadEmail');
		expect((await api('PATCH', `/api/v1/projects/${id}`, { as: 'designer', json: { leadEmail: null } })).status).toBe(409);
		const own = await api('PATCH', `/api/v1/projects/${id}`, { as: 'designer', json: { leadEmail: submitterLead.email } });
		expect(own.status).toBe(409);
		expect(own.body.error.message).toMatch(/own submission/);
		expect((await api('PATCH', `/api/v1/projects/${id}`, { as: 'librarian', json: { leadEmail: 'lead@demo.test' } })).status).toBe(403);
		expect((await api('PATCH', `/api/v1/projects/${id}`, { as: 'designer', json: { leadEmail: 'lead@demo.test', name: 'x' } })).status).toBe(400);
	});
});

describe('the project page', () => {
	test('the lead and the members change through the forms, and the activity says so', async () => {
		const extra = await someone(['designer'], 'Odile Fenn');
		const id = await openReview({ memberEmails: [extra.email] });
		const lead = await browse(`/projects/${id}?/lead`, { as: 'designer', form: { leadEmail: 'lead@demo.test' } });
		expect(lead.status).toBe(200);
		const removed = await browse(`/projects/${id}?/removeMember`, { as: 'lead', form: { email: extra.email } });
		expect(removed.status).toBe(200);
		const bad = await browse(`/projects/${id}?/lead`, { as: 'designer', form: { leadEmail: 'designer@demo.test' } });
		expect(bad.status).toBe(422);
		const page = await browse(`/projects/${id}`, { as: 'designer' });
		expect(page.text).toContain('named Marisol Achterberg the lead');
		expect(page.text).toContain('removed Odile Fenn from the project');
		expect(page.text).toContain('Change the lead');
	});
});

describe('the projects a person may add a part to', () => {
	test('?mine=1&open=1 lists the caller\'s projects whose shortlist may change, and no others', async () => {
		const draft = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('Open one'), requirement: { biasV: -1, temperatureC: 25 } } });
		const inReview = await openReview();
		const stranger = await someone(['designer'], 'Hedda Quist');
		const theirs = await api('POST', '/api/v1/projects', { json: { name: unique('Not mine'), requirement: { biasV: -1, temperatureC: 25 } }, headers: { authorization: `Bearer ${stranger.token}` } });
		const ids = (await api('GET', '/api/v1/projects?mine=1&open=1', { as: 'designer' })).body.items.map((p: { id: number }) => p.id);
		expect(ids).toContain(draft.body.id);
		expect(ids).not.toContain(inReview);
		expect(ids).not.toContain(theirs.body.id);
		const all = (await api('GET', '/api/v1/projects', { as: 'designer' })).body.items.map((p: { id: number }) => p.id);
		expect(all).toEqual(expect.arrayContaining([draft.body.id, inReview, theirs.body.id]));
	});
});
