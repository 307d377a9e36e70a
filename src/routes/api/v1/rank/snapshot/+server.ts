import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { modelCache } from '$lib/server/model-cache';
import { gzipped, snapshotAnswer } from '$lib/server/rank-snapshot';
import { snapshotQuerySchema } from '$lib/schemas/rank-snapshot';

// The catalogue's ranking inputs as a binary snapshot, for ranking in the browser: all of
// it, or with ?since=<version> / ?parts=<ids> only what changed. The ETag is the content's
// version, so a browser that holds it gets 304 and no body.
export const GET = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const query = snapshotQuerySchema.parse(Object.fromEntries(event.url.searchParams));
	const answer = snapshotAnswer((await modelCache()).snapshot, { since: query.since, partIds: query.parts });
	// Sent gzipped to a client that takes it (every browser), under its own tag.
	const zip = /\bgzip\b/.test(event.request.headers.get('accept-encoding') ?? '');
	const etag = `"${answer.version}${answer.partial ? `-${hashOf(event.url.search)}` : ''}${zip ? '-gz' : ''}"`;
	const headers: Record<string, string> = {
		etag,
		vary: 'Accept-Encoding',
		// Kept by the browser, asked again each time (a 304 when nothing changed); one person's.
		'cache-control': 'private, no-cache',
		'x-snapshot-version': answer.version,
		'x-snapshot-parts': String(answer.parts)
	};
	if (event.request.headers.get('if-none-match') === etag) return new Response(null, { status: 304, headers });
	if (zip) headers['content-encoding'] = 'gzip';
	const body = zip ? new Uint8Array(await gzipped(answer)) : answer.bytes;
	return new Response(body, { headers: { ...headers, 'content-type': 'application/octet-stream' } });
});

/** A short digest of the query, so two different partial answers never share a tag. */
function hashOf(s: string): string {
	let h = 2166136261;
	for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
	return (h >>> 0).toString(36);
}
