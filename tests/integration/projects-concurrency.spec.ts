// Fifty decisions on one submission at once: exactly one is recorded, the rest are told
// someone acted first (409), and the project moved by exactly one version.
import { expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { auditLog, mailOutbox, projects, reviewEvents } from '$lib/server/db/schema';
import { api, unique } from './helpers';
import { makePart } from './projects-fixtures';

test('50 concurrent decisions on one submission record exactly one', async () => {
	const name = unique('Photodiode bias');
	const created = await api('POST', '/api/v1/projects', {
		as: 'designer',
		json: { name, requirement: { biasV: -2, temperatureC: 40, leakageTargetA: 1e-10 } }
	});
	const id = created.body.id as number;
	await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: (await makePart()).id } });
	expect((await api('POST', `/api/v1/projects/${id}/review`, { as: 'designer', json: { action: 'submit', comment: '' } })).status).toBe(200);
	const [before] = await db.select().from(projects).where(eq(projects.id, id));

	const actions = ['approve', 'request-changes', 'reject'] as const;
	const results = await Promise.all(
		Array.from({ length: 50 }, (_, i) =>
			api('POST', `/api/v1/projects/${id}/review`, { as: 'lead', json: { action: actions[i % 3], comment: `decision ${i}` } })
		)
	);
	const statuses = results.map((r) => r.status);
	expect(statuses.filter((s) => s === 200)).toHaveLength(1);
	expect(statuses.filter((s) => s === 409)).toHaveLength(49);
	for (const r of results.filter((x) => x.status === 409)) expect(r.body.error.code).toBe('conflict');

	const winner = results.find((r) => r.status === 200)!;
	const [after] = await db.select().from(projects).where(eq(projects.id, id));
	expect(after.version).toBe(before.version + 1);
	expect(after.state).toBe(winner.body.state);
	const decisions = (await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, id))).filter((e) => e.action !== 'submit');
	expect(decisions).toHaveLength(1);
	const audits = (await db.select().from(auditLog).where(eq(auditLog.entityId, String(id)))).filter((a) => a.action.startsWith('review.') && a.action !== 'review.submit');
	expect(audits).toHaveLength(1);
	// One decision mail to the submitter, not fifty.
	const mails = (await db.select().from(mailOutbox).where(eq(mailOutbox.to, 'designer@demo.test'))).filter((m) => m.subject.includes(name));
	expect(mails).toHaveLength(1);
});
