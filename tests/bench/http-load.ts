/**
 * Loopback HTTP load with autocannon against the running app (APP_URL), bounded in
 * connections and time. Shared by the load benchmark and the short smoke test in npm test.
 */
import autocannon from 'autocannon';

export type LoadMix = { method: 'GET' | 'POST'; path: string; body?: string }[];

export type LoadSummary = {
	requests: number;
	errors: number;
	timeouts: number;
	non2xx: number;
	statusCodes: Record<string, number>;
	p50Ms: number;
	p99Ms: number;
	rps: number;
};

/** Runs the mix round-robin on every connection for `seconds` (or `amount` requests). */
export async function runLoad(opts: {
	url: string;
	token: string;
	mix: LoadMix;
	connections: number;
	seconds?: number;
	amount?: number;
}): Promise<LoadSummary> {
	const result = await autocannon({
		url: opts.url,
		connections: opts.connections,
		duration: opts.amount ? undefined : (opts.seconds ?? 10),
		amount: opts.amount,
		timeout: 30,
		headers: { authorization: `Bearer ${opts.token}`, accept: 'application/json' },
		requests: opts.mix.map((r) => ({
			method: r.method,
			path: r.path,
			body: r.body,
			headers: r.body ? { 'content-type': 'application/json', authorization: `Bearer ${opts.token}` } : undefined
		}))
	});
	const statusCodes: Record<string, number> = {};
	for (const [code, stat] of Object.entries(result.statusCodeStats ?? {})) statusCodes[code] = (stat as { count: number }).count;
	return {
		requests: result.requests.total,
		errors: result.errors,
		timeouts: result.timeouts,
		non2xx: result.non2xx,
		statusCodes,
		p50Ms: result.latency.p50,
		p99Ms: result.latency.p99,
		rps: result.requests.average
	};
}

/** Ranking, catalogue search and part pages, as a designer's day mixes them. */
export function designerMix(partIds: number[]): LoadMix {
	const mix: LoadMix = [];
	const ops = [
		{ biasV: -5, temperatureRangeC: [0, 85], clampCurrentA: 1e-3, maxForwardDropV: 0.7, limit: 50 },
		{ biasV: -0.1, temperatureC: 40, limit: 20 },
		{ biasV: -15, temperatureRangeC: [-20, 125], kinds: ['diode', 'jfet-gate'], limit: 100 }
	];
	const queries = ['LX-0012', 'tallowmere', 'schotky', 'glass', 'jfet'];
	for (let i = 0; i < Math.max(6, partIds.length ? 6 : 0); i++) {
		mix.push({ method: 'POST', path: '/api/v1/rank', body: JSON.stringify(ops[i % ops.length]) });
		mix.push({ method: 'GET', path: `/api/v1/junctions?q=${encodeURIComponent(queries[i % queries.length])}&limit=25` });
		if (partIds.length) mix.push({ method: 'GET', path: `/parts/${partIds[(i * 7919) % partIds.length]}` });
	}
	return mix;
}
