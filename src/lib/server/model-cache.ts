/**
 * Every part's model held in memory, in the engine's typed-array catalogue table, so a
 * ranking never touches the database. Loaded from parts + part_models at first use and
 * kept current by PostgreSQL LISTEN/NOTIFY on MODEL_CHANNEL (payload: the part id):
 * each change re-reads that one part and rebuilds the table shortly after. Whenever the
 * listening connection (re)connects, everything is re-read, so nothing missed while it
 * was down stays stale.
 */
import type { Sql } from 'postgres';
import { CatalogueTable, createModel, type JunctionModel, type PartRecord } from '$lib/junction';
import { engineMaterial } from '$lib/catalogue/models';
import type { Material } from '$lib/catalogue/vocabulary';
import type { RankKind, RankLifecycle, SpiceModel } from '$lib/schemas/rank';
import { MODEL_CHANNEL } from './model-events';

/** What the ranking needs to know about a part besides its models. */
export type CachedPart = {
	id: number;
	partNumber: string;
	maker: string;
	kind: RankKind;
	package: string;
	lifecycle: RankLifecycle;
	material: string;
	ratedReverseV: number | null;
	modelVersion: number;
	/** Lower-cased part number, maker and tags, for the text filter. */
	search: string;
	typical: SpiceModel;
	record: PartRecord;
};

type Row = {
	id: number;
	part_number: string;
	maker: string;
	kind: RankKind;
	package: string;
	lifecycle: RankLifecycle;
	material: Material;
	admits_light: boolean;
	rated_reverse_v: number | null;
	rated_forward_a: number | null;
	shunt_factor_per_10k: number;
	tags: string[];
	model_version: number;
	typical: SpiceModel;
	sample_models: SpiceModel[];
	measured: { minCurrentA: number | null; temperaturesC: number[]; reverseMeasured: boolean; worstRmsResidualV: number | null };
};

/** The engine model of one stored model; EG/XTI defaults by material come from the engine. */
function toEngineModel(m: SpiceModel, row: Row): JunctionModel {
	return createModel({ ...m, shuntFactorPer10K: row.shunt_factor_per_10k }, engineMaterial(row.material, row.kind));
}

/** Builds the engine record for a row; throws RangeError when a model is invalid. */
export function partFromRow(row: Row): CachedPart {
	const sampleModels = row.sample_models.length > 0 ? row.sample_models : [row.typical];
	const record: PartRecord = {
		id: String(row.id),
		kind: row.kind,
		samples: sampleModels.map((m) => toEngineModel(m, row)),
		ratings: {
			...(row.rated_reverse_v !== null ? { reverseV: row.rated_reverse_v } : {}),
			...(row.rated_forward_a !== null ? { forwardCurrentA: row.rated_forward_a } : {})
		},
		measured: {
			// No measured current at all: nothing to call an extrapolation against (the
			// reverse-not-measured flag says what is unknown).
			minAbsCurrentA: row.measured.minCurrentA ?? 0,
			temperaturesC: row.measured.temperaturesC ?? [],
			reverseMeasured: row.measured.reverseMeasured === true
		},
		transparentPackage: row.admits_light,
		...(row.measured.worstRmsResidualV !== null && row.measured.worstRmsResidualV !== undefined
			? { fitRmsResidualV: row.measured.worstRmsResidualV }
			: {})
	};
	return {
		id: row.id,
		partNumber: row.part_number,
		maker: row.maker,
		kind: row.kind,
		package: row.package,
		lifecycle: row.lifecycle,
		material: row.material,
		ratedReverseV: row.rated_reverse_v,
		modelVersion: row.model_version,
		search: [row.part_number, row.maker, ...(row.tags ?? [])].join(' ').toLowerCase(),
		typical: row.typical,
		record
	};
}

/** The table plus per-index part facts, swapped in as one immutable snapshot. */
export class CacheSnapshot {
	readonly table: CatalogueTable;
	readonly parts: CachedPart[];
	readonly indexOf: Map<number, number>;
	constructor(parts: CachedPart[]) {
		this.parts = parts;
		this.table = new CatalogueTable(parts.map((p) => p.record));
		this.indexOf = new Map(parts.map((p, i) => [p.id, i]));
	}
}

const SELECT_COLUMNS = `p.id, p.part_number, p.maker, p.kind, p.package, p.lifecycle, p.material, p.admits_light,
	p.rated_reverse_v, p.rated_forward_a, p.shunt_factor_per_10k, p.tags, p.model_version,
	m.typical, m.sample_models, m.measured`;

export type ModelCacheOptions = {
	/** Delay between a notification and the rebuild, gathering bursts into one [ms]. */
	rebuildDelayMs?: number;
	/** Called when a part's stored model cannot be turned into an engine model. */
	onSkip?: (partId: number, reason: string) => void;
};

export class ModelCache {
	private byId = new Map<number, CachedPart>();
	private snap: CacheSnapshot = new CacheSnapshot([]);
	private loading: Promise<void> | null = null;
	private rebuildTimer: ReturnType<typeof setTimeout> | null = null;
	private pendingIds = new Set<number>();
	private unlisten: (() => Promise<void>) | null = null;
	private listeners = new Set<() => void>();
	/** Bumped on every rebuild; tests wait on it. */
	generation = 0;
	/** Parts whose models could not be used, with the reason. */
	readonly skipped = new Map<number, string>();

	constructor(
		private readonly sql: Sql,
		private readonly options: ModelCacheOptions = {}
	) {}

	/** Loads everything once and starts listening; later calls return the same promise. */
	ready(): Promise<void> {
		this.loading ??= this.start().catch((e) => {
			this.loading = null;
			throw e;
		});
		return this.loading;
	}

	/** The current snapshot (empty until ready() resolved). */
	get snapshot(): CacheSnapshot {
		return this.snap;
	}

	private async start(): Promise<void> {
		// onlisten runs on every (re)connection of the dedicated listening connection.
		let first = true;
		const meta = await this.sql.listen(
			MODEL_CHANNEL,
			(payload) => this.changed(payload),
			() => {
				if (first) {
					first = false;
					return;
				}
				void this.reloadAll();
			}
		);
		this.unlisten = meta.unlisten;
		await this.reloadAll();
	}

	/** Re-reads every part and rebuilds the table now. */
	async reloadAll(): Promise<void> {
		const rows = (await this.sql.unsafe(
			`select ${SELECT_COLUMNS} from parts p join part_models m on m.part_id = p.id order by p.id`
		)) as unknown as Row[];
		const next = new Map<number, CachedPart>();
		this.skipped.clear();
		for (const row of rows) {
			const part = this.tryBuild(row);
			if (part) next.set(part.id, part);
		}
		this.byId = next;
		this.rebuild();
	}

	private tryBuild(row: Row): CachedPart | null {
		try {
			return partFromRow(row);
		} catch (e) {
			const reason = e instanceof Error ? e.message : String(e);
			this.skipped.set(row.id, reason);
			this.options.onSkip?.(row.id, reason);
			return null;
		}
	}

	private changed(payload: string): void {
		const id = Number(payload);
		if (!Number.isInteger(id) || id <= 0) return;
		this.pendingIds.add(id);
		if (this.rebuildTimer) return;
		this.rebuildTimer = setTimeout(() => {
			this.rebuildTimer = null;
			void this.applyPending();
		}, this.options.rebuildDelayMs ?? 25);
	}

	private async applyPending(): Promise<void> {
		const ids = [...this.pendingIds];
		this.pendingIds.clear();
		if (ids.length === 0) return;
		const rows = (await this.sql.unsafe(
			`select ${SELECT_COLUMNS} from parts p join part_models m on m.part_id = p.id where p.id = any($1::int[])`,
			[ids]
		)) as unknown as Row[];
		const found = new Set<number>();
		for (const row of rows) {
			found.add(row.id);
			this.skipped.delete(row.id);
			const part = this.tryBuild(row);
			if (part) this.byId.set(part.id, part);
			else this.byId.delete(row.id);
		}
		for (const id of ids) if (!found.has(id)) this.byId.delete(id);
		this.rebuild();
	}

	private rebuild(): void {
		const parts = [...this.byId.values()].sort((a, b) => a.id - b.id);
		this.snap = new CacheSnapshot(parts);
		this.generation++;
		for (const l of [...this.listeners]) l();
	}

	/** Resolves after the next rebuild, or rejects after `ms`. */
	nextRebuild(ms = 10_000): Promise<void> {
		return new Promise((resolve, reject) => {
			const done = () => {
				clearTimeout(timer);
				this.listeners.delete(done);
				resolve();
			};
			const timer = setTimeout(() => {
				this.listeners.delete(done);
				reject(new Error(`model cache did not rebuild within ${ms} ms`));
			}, ms);
			this.listeners.add(done);
		});
	}

	/** Stops listening (tests and shutdown). */
	async close(): Promise<void> {
		if (this.rebuildTimer) clearTimeout(this.rebuildTimer);
		await this.unlisten?.();
		this.unlisten = null;
	}
}

let shared: ModelCache | null = null;

/** This process's cache over the app's database pool, ready to use. */
export async function modelCache(): Promise<ModelCache> {
	if (!shared) {
		const { client } = await import('./db');
		shared = new ModelCache(client, {
			onSkip: (id, reason) => console.warn(`model cache: part ${id} left out: ${reason}`)
		});
	}
	await shared.ready();
	return shared;
}
