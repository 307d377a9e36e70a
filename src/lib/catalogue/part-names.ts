/**
 * How every API answer that lists parts names one (a part's page, a ranking, a node's
 * ranking): the same fields in the same words, from a stored part or the ranking's cache.
 */
export function partNames<K extends string>(p: { id: number; partNumber: string; maker: string; kind: K; package: string }) {
	return { id: p.id, partNumber: p.partNumber, maker: p.maker, kind: p.kind, package: p.package };
}

/** A listed part's names with its lifecycle and ratings, as rank items carry them. */
export function listedPart<K extends string, L extends string>(p: {
	id: number;
	partNumber: string;
	maker: string;
	kind: K;
	package: string;
	lifecycle: L;
	ratedReverseV: number | null;
	ratedForwardA: number | null;
}) {
	// Written out rather than spread from partNames: one object of one shape, made per listed part of every ranking.
	return {
		id: p.id,
		partNumber: p.partNumber,
		maker: p.maker,
		kind: p.kind,
		package: p.package,
		lifecycle: p.lifecycle,
		ratedReverseV: p.ratedReverseV,
		ratedForwardA: p.ratedForwardA
	};
}
