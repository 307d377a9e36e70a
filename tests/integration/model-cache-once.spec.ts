// A cold server meets its first rankings all at once: they must share one model cache
// (one full load, one listening connection), not each make their own.
import { afterAll, expect, test } from 'vitest';
import { closeModelCache, modelCache } from '$lib/server/model-cache';
import { client } from '$lib/server/db';

afterAll(async () => {
	await closeModelCache();
});

test('requests that ask for the cache together get the same one, and one listener', async () => {
	const listenersBefore = await listeners();
	const caches = await Promise.all(Array.from({ length: 12 }, () => modelCache()));
	expect(new Set(caches).size).toBe(1);
	expect((await listeners()) - listenersBefore).toBe(1);
});

/** Connections listening on the projects channel, which each cache's listener joins. */
async function listeners(): Promise<number> {
	const [{ n }] = await client`select count(*)::int as n from pg_stat_activity where datname = current_database() and query ilike 'listen "junction_projects"%'`;
	return n;
}
