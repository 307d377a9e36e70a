// A protected node as a project's requirement: saved through the API, every shortlisted part
// judged in it (each candidate position holding the part), the verdict following its limits,
// and the node with each part's figures kept in the review snapshot.
import { describe, expect, test } from 'vitest';
import { desc, eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { reviewEvents } from '$lib/server/db/schema';
import type { Snapshot } from '$lib/server/review';
import { api, browse, unique, type ApiResult } from './helpers';
import { makePart } from './projects-fixtures';

const NODE = {
	rails: { VPOS: 5, VNEG: -5 },
	signalRangeV: [-2, 2],
	temperatureRangeC: [0, 70],
	sourceResistanceOhm: 1e9,
	faultCurrentA: 0.01,
	maxNetCurrentA: 1e-9,
	junctions: [
		{ candidate: true, anode: 'node', cathode: 'VPOS', label: 'upper' },
		{ candidate: true, anode: 'VNEG', cathode: 'node', label: 'lower' }
	]
};
const REQUIREMENT = { biasV: -7, temperatureRangeC: [0, 70] };

async function entriesWithNode(id: number): Promise<ApiResult> {
	for (let i = 0; i < 100; i++) {
		const r = await api('GET', `/api/v1/projects/${id}`, { as: 'designer' });
		if (r.body.entries.length && r.body.entries.every((e: { node: unknown }) => e.node)) return r;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error(`project ${id}: node figures never arrived`);
}

describe('a node as the requirement', () => {
	test('judges each shortlisted part in the node, as POST /api/v1/node would, and snapshots it at review', async () => {
		// One tight part, and one with a 1 GΩ shunt: 2 V/1 GΩ·2 = 4 nA net at the ends, over the 1 nA limit.
		const tight = await makePart({ model: { IS: 2e-15, N: 1.02 } });
		const shunted = await makePart({ model: { IS: 2e-15, N: 1.02, RSH: 1e9 } });
		const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('pH input'), requirement: { ...REQUIREMENT, node: NODE } } });
		expect(created.status, JSON.stringify(created.body)).toBe(201);
		expect(created.body.requirement.node.junctions).toHaveLength(2);
		const id = created.body.id as number;
		for (const p of [tight, shunted]) expect((await api('POST', `/api/v1/projects/${id}/shortlist`, { as: 'designer', json: { junctionId: p.id } })).status).toBe(201);

		const r = await entriesWithNode(id);
		const byPart = new Map(r.body.entries.map((e: { junctionId: number }) => [e.junctionId, e])) as Map<number, any>;
		for (const p of [tight, shunted]) {
			const direct = await api('POST', '/api/v1/node', {
				as: 'designer',
				json: { ...NODE, junctions: NODE.junctions.map(({ candidate: _c, ...j }) => ({ ...j, id: p.id })) }
			});
			expect(direct.status, JSON.stringify(direct.body)).toBe(200);
			const e = byPart.get(p.id);
			expect(e.node.netCurrentA.worst).toBe(direct.body.worst.netCurrentA);
			expect(e.node.noiseA_rtHz).toBe(direct.body.noise.densityA_rtHz);
			expect(e.node.excursionV).toEqual({ cold: direct.body.fault.excursionV.cold, hot: direct.body.fault.excursionV.hot });
		}
		expect(byPart.get(tight.id).verdict.node.status).toBe('pass');
		expect(byPart.get(shunted.id).verdict.node.status).toBe('fail');
		// 4 nA through 1 GΩ is 4 V: the node does not stay at the signal either.
		expect(byPart.get(shunted.id).verdict.node.flags).toEqual(['over-net-current-limit', 'error-shifts-bias']);
		expect(byPart.get(shunted.id).verdict.overall).toBe('fail');

		const submitted = await api('POST', `/api/v1/projects/${id}/review`, { as: 'designer', json: { action: 'submit', comment: 'rail pair' } });
		expect(submitted.status).toBe(200);
		const [event] = await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, id)).orderBy(desc(reviewEvents.id)).limit(1);
		const snap = event.snapshot as Snapshot;
		expect(snap.requirement.node?.junctions.map((j) => j.label)).toEqual(['upper', 'lower']);
		expect(snap.entries.find((e) => e.partId === shunted.id)?.node?.flags).toContain('over-net-current-limit');
		expect(snap.entries.find((e) => e.partId === tight.id)?.node?.meetsLimits).toBe(true);
		// The printed record shows the node and each part's figures from the snapshot.
		const record = await browse(`/projects/${id}/export/record`, { as: 'lead' });
		expect(record.text).toContain('In the protected node, as it stood');
		expect(record.text).toMatch(/data-node-verdict="fail"/);
		// Locked in review: the node cannot change under the lead.
		expect((await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: NODE })).status).toBe(409);
	});

	test('can be set on, replaced in and taken out of an existing project', async () => {
		const created = await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('electrometer'), requirement: REQUIREMENT } });
		const id = created.body.id as number;
		const set = await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: NODE });
		expect(set.status, JSON.stringify(set.body)).toBe(200);
		expect(set.body.requirement).toMatchObject({ biasV: -7, node: { signalRangeV: [-2, 2] } });
		const guardPair = { rails: {}, guard: { offsetV: 1e-3 }, signalRangeV: [-1, 1], temperatureC: 25, junctions: [{ candidate: true, anode: 'node', cathode: 'guard' }, { candidate: true, anode: 'guard', cathode: 'node' }] };
		expect((await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: guardPair })).body.requirement.node.guard).toEqual({ offsetV: 1e-3 });
		expect((await api('DELETE', `/api/v1/projects/${id}/node`, { as: 'designer' })).status).toBe(204);
		expect((await api('GET', `/api/v1/projects/${id}`, { as: 'designer' })).body.requirement.node).toBeUndefined();
		const activity = await api('GET', `/api/v1/projects/${id}`, { as: 'designer' });
		expect(activity.status).toBe(200);
	});

	test('refuses a node that names no candidate, an inline model or a missing part', async () => {
		const id = (await api('POST', '/api/v1/projects', { as: 'designer', json: { name: unique('bad node'), requirement: REQUIREMENT } })).body.id as number;
		const noCandidate = await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: { ...NODE, junctions: [{ id: 1, anode: 'node', cathode: 'VPOS' }] } });
		expect(noCandidate.status).toBe(400);
		expect(noCandidate.body.error.issues[0].path).toBe('junctions');
		const inline = await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: { ...NODE, junctions: [...NODE.junctions, { model: { IS: 1e-14, N: 1 }, anode: 'node', cathode: 'VPOS' }] } });
		expect(inline.status).toBe(400);
		expect(inline.body.error.issues.map((i: { path: string }) => i.path)).toContain('junctions.2.model');
		const missing = await api('PUT', `/api/v1/projects/${id}/node`, { as: 'designer', json: { ...NODE, junctions: [...NODE.junctions, { id: 2_000_000_000, anode: 'node', cathode: 'VPOS' }] } });
		expect(missing.status).toBe(422);
		expect(missing.body.error.issues[0].path).toBe('junctions.2.id');
		expect((await api('PUT', `/api/v1/projects/${id}/node`, { as: 'lead', json: NODE })).status).toBe(403);
		expect((await api('GET', `/api/v1/projects/${id}`, { as: 'designer' })).body.requirement.node).toBeUndefined();
	});
});
