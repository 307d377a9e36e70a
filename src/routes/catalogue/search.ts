// Typo-tolerant search over the compact catalogue, built once per page load.
//
// Fuse.js does the fuzzy matching, but never over the whole catalogue on a keystroke:
//  - part numbers: a gram index (first character, unordered character pairs and ordered
//    triples of the number without punctuation) picks the few hundred parts whose numbers share most grams with
//    the query, and Fuse scores only those;
//  - makers, tags and kinds: few distinct words shared by many parts, so Fuse runs over the
//    distinct words and a hit stands for every part carrying it.
// Exact, prefix and substring hits come from plain string tests on lowercase copies made
// once, and rank before fuzzy ones. Queries of one or two characters match only that way.
// Pure: no DOM, no stores; the index is built once and only read by `search`.
import Fuse, { type IFuseOptions } from 'fuse.js';
import type { CompactPart } from '$lib/catalogue/compact-part';
import { KIND_LABEL } from '$lib/catalogue/vocabulary';

export type Filters = { q: string; kind: string; pkg: string; mat: string; life: string };

/** Most parts handed to Fuse for the part-number match on one keystroke. */
export const MAX_CANDIDATES = 400;
/** Queries shorter than this match by substring and word prefix only. */
const FUZZY_MIN = 3;

// Ranking tiers, best first; fuzzy hits add their Fuse score (0…1) to the last one.
const EXACT = 0;
const PREFIX = 1;
const SUBSTRING = 2;
const WORD = 3;
const FUZZY = 4;

const FUSE: IFuseOptions<unknown> = { threshold: 0.38, ignoreLocation: true, includeScore: true };
const PN_KEYS = [
	{ name: 'pn', weight: 3 },
	{ name: 'pnFlat', weight: 2 }
];

type PnDoc = { i: number; pn: string; pnFlat: string };
/** A maker, tag or kind, with the positions of the parts that carry it. */
type Term = { t: string; lower: string; flat: string; parts: number[] };

export type SearchIndex = {
	parts: CompactPart[];
	pnLower: string[];
	pnFlat: string[];
	pnDocs: PnDoc[];
	grams: Map<string, Int32Array>;
	terms: Term[];
	termFuse: Fuse<Term>;
	// Scratch space reused by every search (search is synchronous).
	counts: Uint16Array;
	best: Float64Array;
};

const flatten = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');

/**
 * Grams of a flattened part number: its first character (anchored), unordered pairs (a
 * swapped pair still shares one) and ordered triples.
 */
function gramsOf(flat: string): Set<string> {
	const out = new Set<string>();
	if (flat) out.add('^' + flat[0]);
	for (let k = 0; k + 1 < flat.length; k++) {
		const a = flat[k];
		const b = flat[k + 1];
		out.add(a < b ? a + b : b + a);
		if (k + 2 < flat.length) out.add(flat.slice(k, k + 3));
	}
	return out;
}

export function buildIndex(parts: CompactPart[]): SearchIndex {
	const pnLower = parts.map((p) => p.pn.toLowerCase());
	const pnFlat = parts.map((p) => flatten(p.pn));
	const pnDocs = parts.map((p, i) => ({ i, pn: p.pn, pnFlat: pnFlat[i] }));

	const lists = new Map<string, number[]>();
	pnFlat.forEach((flat, i) => {
		for (const g of gramsOf(flat)) {
			const l = lists.get(g);
			if (l) l.push(i);
			else lists.set(g, [i]);
		}
	});
	const grams = new Map<string, Int32Array>();
	for (const [g, l] of lists) grams.set(g, Int32Array.from(l));

	const byText = new Map<string, number[]>();
	const carry = (t: string, i: number) => {
		if (!t) return;
		const l = byText.get(t);
		if (!l) byText.set(t, [i]);
		else if (l[l.length - 1] !== i) l.push(i);
	};
	parts.forEach((p, i) => {
		carry(p.mk, i);
		for (const tag of p.tags) carry(tag, i);
		carry(`${p.kind} ${KIND_LABEL[p.kind] ?? ''}`.trim(), i);
	});
	const terms: Term[] = [...byText].map(([t, l]) => ({ t, lower: t.toLowerCase(), flat: flatten(t), parts: l }));

	return {
		parts,
		pnLower,
		pnFlat,
		pnDocs,
		grams,
		terms,
		termFuse: new Fuse(terms, { ...FUSE, keys: ['t'] }),
		counts: new Uint16Array(parts.length),
		best: new Float64Array(parts.length).fill(Infinity)
	};
}

/** Does the term have a word starting with q (words split at spaces, hyphens, slashes…)? */
function wordPrefix(lower: string, q: string): boolean {
	let at = lower.indexOf(q);
	while (at >= 0) {
		if (at === 0 || !/[a-z0-9]/.test(lower[at - 1])) return true;
		at = lower.indexOf(q, at + 1);
	}
	return false;
}

/**
 * The parts whose numbers share most grams with the query, best first, as their positions
 * and how much of the query's grams each shares (0…1).
 */
function candidates(ix: SearchIndex, qFlat: string, pass: (i: number) => boolean): { at: number[]; shared: number[] } {
	const { counts } = ix;
	const touched: number[] = [];
	let top = 0;
	let total = 0;
	for (const g of gramsOf(qFlat)) {
		const w = g.length === 3 ? 2 : 1;
		total += w;
		const list = ix.grams.get(g);
		if (!list) continue;
		for (let k = 0; k < list.length; k++) {
			const i = list[k];
			if (counts[i] === 0) touched.push(i);
			const c = (counts[i] += w);
			if (c > top) top = c;
		}
	}
	// Bucket by shared-gram count, then take from the fullest buckets down.
	const buckets: number[][] = Array.from({ length: top + 1 }, () => []);
	for (const i of touched) {
		if (pass(i)) buckets[counts[i]].push(i);
		counts[i] = 0;
	}
	const at: number[] = [];
	const shared: number[] = [];
	for (let c = top; c > 0 && at.length < MAX_CANDIDATES; c--) {
		const b = buckets[c];
		for (let k = 0; k < b.length && at.length < MAX_CANDIDATES; k++) {
			at.push(b[k]);
			shared.push(c / total);
		}
	}
	return { at, shared };
}

/** Parts matching the filters, best match first when there is a query. */
export function search(parts: CompactPart[], index: SearchIndex, f: Filters): CompactPart[] {
	const pass = (p: CompactPart) => (!f.kind || p.kind === f.kind) && (!f.pkg || p.pkg === f.pkg) && (!f.mat || p.mat === f.mat) && (!f.life || p.life === f.life);
	const q = f.q.trim().toLowerCase();
	if (!q) return parts.filter(pass);

	const ix = index;
	const all = ix.parts;
	const passAt = (i: number) => pass(all[i]);
	const qFlat = flatten(q);
	const { best } = ix;
	const hit: number[] = [];
	const note = (i: number, rank: number) => {
		if (best[i] === Infinity) {
			if (!passAt(i)) return;
			hit.push(i);
		}
		if (rank < best[i]) best[i] = rank;
	};

	// Part numbers, literally: exact, then prefix, then anywhere; shorter remainders first.
	for (let i = 0; i < all.length; i++) {
		const lower = ix.pnLower[i];
		const flat = ix.pnFlat[i];
		let tier = -1;
		if (lower === q || (qFlat && flat === qFlat)) tier = EXACT;
		else if (lower.startsWith(q) || (qFlat && flat.startsWith(qFlat))) tier = PREFIX;
		else if (lower.includes(q) || (qFlat && flat.includes(qFlat))) tier = SUBSTRING;
		if (tier >= 0) note(i, tier + (flat.length - qFlat.length) / (flat.length + 1) / 2);
	}

	// Makers, tags and kinds, literally: a word starting with the query, or (long enough) containing it.
	const literal = new Set<Term>();
	for (const term of ix.terms) {
		const ok = q.length < FUZZY_MIN ? wordPrefix(term.lower, q) : term.lower.includes(q) || (qFlat.length >= FUZZY_MIN && term.flat.includes(qFlat));
		if (!ok) continue;
		literal.add(term);
		for (const i of term.parts) note(i, WORD);
	}

	if (q.length >= FUZZY_MIN) {
		// Part numbers, fuzzily, over the few parts that share grams with the query. Fuse
		// often scores several numbers alike (two slips each); more grams shared goes first.
		if (qFlat.length >= 2) {
			const { at, shared } = candidates(ix, qFlat, passAt);
			const docs = at.map((i, k) => ({ ...ix.pnDocs[i], k }));
			if (docs.length)
				for (const r of new Fuse(docs, { ...FUSE, keys: PN_KEYS }).search(q)) note(r.item.i, FUZZY + (r.score ?? 1) * 0.999 + (1 - shared[r.item.k]) * 1e-4);
		}
		// Makers, tags and kinds, fuzzily, over the distinct words.
		for (const r of ix.termFuse.search(q)) {
			if (literal.has(r.item)) continue;
			const rank = FUZZY + (r.score ?? 1) * 0.999;
			for (const i of r.item.parts) note(i, rank);
		}
	}

	// Rank, then catalogue order; packed into one number for a fast numeric sort.
	const keys = new Float64Array(hit.length);
	const SPAN = 2 ** 21;
	for (let k = 0; k < hit.length; k++) {
		const i = hit[k];
		keys[k] = Math.round(best[i] * 1e6) * SPAN + i;
		best[i] = Infinity;
	}
	keys.sort();
	const out: CompactPart[] = new Array(keys.length);
	for (let k = 0; k < keys.length; k++) out[k] = all[keys[k] % SPAN];
	return out;
}
