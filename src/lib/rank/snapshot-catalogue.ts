/**
 * The catalogue as the browser holds it: the parts of the model snapshots received so far,
 * in one CatalogueTable built by the engine exactly as the server builds its own (parts in
 * id order, the order that breaks ties), ranked and listed by the same code as
 * POST /api/v1/rank (rank-items.ts). Runs in the ranking worker; pure, so tests run it too.
 */
import { CatalogueTable } from '$lib/junction/catalogue-table';
import { decodeSnapshot, type ModelSnapshot, type SnapshotPart } from '$lib/junction/model-snapshot';
import type { RankKind, RankLifecycle, RankOperatingPoint, RankResponse, SpiceModel } from '$lib/schemas/rank';
import { rankListed, type ListedPart } from './rank-items';

type Held = ListedPart & { modelVersion: number; snapshot: SnapshotPart };

/** A snapshot part as the ranked list reads it. */
function listed(p: SnapshotPart): Held {
	return {
		id: p.id,
		partNumber: p.partNumber,
		maker: p.maker,
		kind: p.record.kind as RankKind,
		package: p.package,
		lifecycle: p.lifecycle as RankLifecycle,
		material: p.material,
		ratedReverseV: p.record.ratings.reverseV ?? null,
		ratedForwardA: p.record.ratings.forwardCurrentA ?? null,
		sampleUnits: p.record.sampleUnits ?? [],
		search: p.search,
		typical: p.typical as SpiceModel,
		capacitanceSource: p.capacitanceSource,
		modelVersion: p.modelVersion,
		snapshot: p
	};
}

export class SnapshotCatalogue {
	private byId = new Map<number, Held>();
	private parts: Held[] = [];
	private table = new CatalogueTable([]);
	/** The version of the last snapshot applied (null before the first). */
	version: string | null = null;

	get size(): number {
		return this.parts.length;
	}

	/** Applies snapshot bytes as the endpoint sent them; returns the decoded snapshot. */
	applyBytes(bytes: ArrayBuffer | Uint8Array): ModelSnapshot {
		const snapshot = decodeSnapshot(bytes);
		this.apply(snapshot);
		return snapshot;
	}

	/**
	 * A full snapshot replaces everything; a partial one replaces the parts it carries and
	 * drops those no longer in its list of catalogue ids. The table is rebuilt once.
	 */
	apply(snapshot: ModelSnapshot): void {
		if (!snapshot.partial) this.byId = new Map();
		for (const p of snapshot.parts) this.byId.set(p.id, listed(p));
		if (snapshot.partial) {
			const keep = new Set(snapshot.catalogueIds);
			for (const id of this.byId.keys()) if (!keep.has(id)) this.byId.delete(id);
		}
		this.parts = [...this.byId.values()].sort((a, b) => a.id - b.id);
		this.table = new CatalogueTable(this.parts.map((p) => p.snapshot.record));
		this.version = snapshot.version;
	}

	/** Ranks at an operating point and lists the best `limit` as POST /api/v1/rank would. */
	rank(op: RankOperatingPoint, limit = 100, withModels = 0, withSamples = false): RankResponse {
		return rankListed(this.table, this.parts, op, limit, withModels, withSamples);
	}
}
