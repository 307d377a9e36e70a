// Typo-tolerant search over the compact catalogue, built once per page load.
import Fuse from 'fuse.js';
import type { CompactPart } from '$lib/server/catalogue';
import { KIND_LABEL } from '$lib/catalogue/vocabulary';

export type Filters = { q: string; kind: string; pkg: string; mat: string; life: string };

export function buildIndex(parts: CompactPart[]) {
	const docs = parts.map((p) => ({ id: p.id, pn: p.pn, pnFlat: p.pn.replace(/[^a-z0-9]/gi, ''), mk: p.mk, tags: p.tags.join(' '), kind: `${p.kind} ${KIND_LABEL[p.kind]}` }));
	return new Fuse(docs, {
		keys: [
			{ name: 'pn', weight: 3 },
			{ name: 'pnFlat', weight: 2 },
			{ name: 'mk', weight: 1 },
			{ name: 'tags', weight: 1 },
			{ name: 'kind', weight: 1 }
		],
		threshold: 0.38,
		ignoreLocation: true,
		includeScore: true
	});
}

/** Part ids matching the filters, best match first when there is a query. */
export function search(parts: CompactPart[], index: ReturnType<typeof buildIndex>, f: Filters): CompactPart[] {
	const byId = new Map(parts.map((p) => [p.id, p]));
	let list: CompactPart[];
	if (f.q.trim()) list = index.search(f.q.trim(), { limit: 500 }).map((r) => byId.get(r.item.id) as CompactPart);
	else list = parts;
	return list.filter((p) => (!f.kind || p.kind === f.kind) && (!f.pkg || p.pkg === f.pkg) && (!f.mat || p.mat === f.mat) && (!f.life || p.life === f.life));
}
