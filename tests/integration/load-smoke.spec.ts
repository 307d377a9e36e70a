// A short version of the load benchmark: concurrent ranking, catalogue search and part
// pages against the built server must all succeed. (Speed is the benchmark's business.)
import { expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { parts } from '$lib/server/db/schema';
import { designerMix, runLoad } from '../bench/http-load';
import { APP_URL, tokenFor } from './helpers';

test('20 connections for 3 s of mixed designer requests: every answer is a 2xx, no errors or timeouts', async () => {
	const ids = (await db.select({ id: parts.id }).from(parts).limit(200)).map((r) => r.id);
	expect(ids.length).toBeGreaterThan(10);
	const s = await runLoad({ url: APP_URL, token: await tokenFor('designer'), mix: designerMix(ids), connections: 20, seconds: 3 });
	expect(s.requests).toBeGreaterThan(20);
	expect({ errors: s.errors, timeouts: s.timeouts, non2xx: s.non2xx }).toEqual({ errors: 0, timeouts: 0, non2xx: 0 });
});
