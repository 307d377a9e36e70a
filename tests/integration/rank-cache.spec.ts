// The model cache follows LISTEN/NOTIFY: a cache in this test process (its own postgres
// client) and the running server (another process) both see a change made elsewhere.
import { afterAll, expect, test } from 'vitest';
import postgres from 'postgres';
import { eq, sql as dsql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { partModels, parts } from '$lib/server/db/schema';
import { notifyModelChanged } from '$lib/server/model-events';
import { ModelCache } from '$lib/server/model-cache';
import { predictParts } from '$lib/server/ranking';
import { api, unique } from './helpers';
import { createParts, deleteParts } from './rank-fixtures';

const client = postgres(process.env.DATABASE_URL!, { max: 2, onnotice: () => {} });
const cache = new ModelCache(client, { rebuildDelayMs: 5 });
const ids: number[] = [];

afterAll(async () => {
	await deleteParts(ids);
	await cache.close();
	await client.end();
});

const op = { biasV: -5, temperatureC: 25 };

test('a second process and a second cache both see a model change', async () => {
	await cache.ready();
	const tag = unique('cache');
	const model = { IS: 1e-15, N: 1, TNOM: 27 };
	let rebuilt = cache.nextRebuild();
	const [id] = await createParts([{ partNumber: `${tag}-X`, samples: [model, model, model] }]);
	ids.push(id);
	await rebuilt;
	const before = (await predictParts([id], op, cache)).get(id)!;
	expect(before.leakageA.worst).toBeGreaterThan(0);

	// Another writer raises IS a hundredfold and announces it in its transaction.
	rebuilt = cache.nextRebuild();
	await db.transaction(async (tx) => {
		const bigger = { ...model, IS: 1e-13 };
		await tx.update(partModels).set({ typical: bigger, sampleModels: [bigger, bigger, bigger] }).where(eq(partModels.partId, id));
		await tx.update(parts).set({ modelVersion: dsql`${parts.modelVersion} + 1` }).where(eq(parts.id, id));
		await notifyModelChanged(tx, id);
	});
	await rebuilt;
	const after = (await predictParts([id], op, cache)).get(id)!;
	// Reverse leakage far below −3·N·Vt is −IS(T): a hundred times IS, a hundred times the leakage.
	expect(after.leakageA.worst / before.leakageA.worst).toBeCloseTo(100, 6);
	expect(after.modelVersion).toBe(before.modelVersion + 1);

	// The server process sees it too.
	let seen = 0;
	for (let i = 0; i < 100 && !(seen > 0 && Math.abs(seen / after.leakageA.worst - 1) < 1e-12); i++) {
		const r = await api('POST', '/api/v1/rank', { as: 'designer', json: { ...op, q: tag } });
		seen = r.body.items[0]?.leakageA.worst ?? 0;
		if (Math.abs(seen / after.leakageA.worst - 1) >= 1e-12) await new Promise((res) => setTimeout(res, 100));
	}
	expect(seen / after.leakageA.worst).toBeCloseTo(1, 12);

	// Deleting the part takes it out of both.
	rebuilt = cache.nextRebuild();
	await deleteParts([id]);
	await rebuilt;
	expect((await predictParts([id], op, cache)).has(id)).toBe(false);
});
