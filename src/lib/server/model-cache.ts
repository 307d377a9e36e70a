/**
 * Every part's model held in memory, in the engine's typed-array catalogue table, so a
 * ranking never touches the database. Loaded from parts + part_models at first use and
 * kept current by PostgreSQL LISTEN/NOTIFY on MODEL_CHANNEL (payload: the part id):
 * each change re-reads that one part and rebuilds the table shortly after. Whenever the
 * listening connection (re)connects, everything is re-read, so nothing missed while it
 * was down stays stale.
 *
 * The driver re-listens by itself after a lost connection, but gives up silently when the
 * database is still down at that moment. So the cache checks that it can hear: every few
 * seconds it sends itself a ping on the channel, and when a ping it sent does not come back
 * it opens a new listening connection and re-reads everything.
 *
 * The same connection hears PROJECT_CHANNEL for the live updates of open screens, so one
 * connection per process carries both and the hearing check covers both.
 */
import { randomBytes } from 'node:crypto';
import type { Sql } from 'postgres';
import { CatalogueTable, createModel, type Evidence, type JunctionModel, type PartRecord } from '$lib/junction';
import { engineMaterial } from '$lib/catalogue/models';
import type { Material } from '$lib/catalogue/vocabulary';
import type { RankKind, RankLifecycle, SpiceModel } from '$lib/schemas/rank';
import { MODEL_CHANNEL, PROJECT_CHANNEL } from './model-events';
import type { ListedPart } from '$lib/rank/rank-items';

/** What the ranking needs to know about a part besides its models: the listed part's facts, and the server's own. */
export type CachedPart = ListedPart & {
	modelVersion: number;
	/** Measured on the bench, or only a given model. */
	evidence: Evidence;
	/** The typical model as the engine predicts with it (material defaults, shunt factor). */
	typicalModel: JunctionModel;
	/** Where a given model came from (card, datasheet), when there is one. */
	givenSource: string | null;
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
	sample_units: string[] | null;
	is_measured: boolean;
	given_model_source: string | null;
	measured: { minCurrentA: number | null; temperaturesC: number[]; reverseMeasured: boolean; worstRmsResidualV: number | null };
	capacitance_source: 'measured' | 'given' | null;
};

/** The engine model of one stored model; EG/XTI defaults by material come from the engine. */
function toEngineModel(m: SpiceModel, row: Row): JunctionModel {
	return createModel({ ...m, shuntFactorPer10K: row.shunt_factor_per_10k }, engineMaterial(row.material, row.kind));
}

/** Builds the engine record for a row; throws RangeError when a model is invalid. */
export function partFromRow(row: Row): CachedPart {
	const sampleModels = row.sample_models.length > 0 ? row.sample_models : [row.typical];
	const evidence: Evidence = row.is_measured ? 'measured' : 'given';
	// Units are kept beside the models; a row without them (not yet filled in) numbers its samples.
	const units = row.sample_units ?? [];
	const sampleUnits = evidence === 'given' ? [] : sampleModels.map((_, i) => (units.length === sampleModels.length ? units[i] : `#${i + 1}`));
	const record: PartRecord = {
		id: String(row.id),
		kind: row.kind,
		samples: sampleModels.map((m) => toEngineModel(m, row)),
		sampleUnits,
		evidence,
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
		ratedForwardA: row.rated_forward_a,
		modelVersion: row.model_version,
		evidence,
		sampleUnits,
		search: [row.part_number, row.maker, ...(row.tags ?? [])].join(' ').toLowerCase(),
		typical: row.typical,
		typicalModel: toEngineModel(row.typical, row),
		givenSource: row.given_model_source,
		capacitanceSource: row.capacitance_source ?? null,
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
	p.rated_reverse_v, p.rated_forward_a, p.shunt_factor_per_10k, p.tags, p.model_version, p.given_model_source,
	m.typical, m.sample_models, m.sample_units, m.is_measured, m.measured, c.source as capacitance_source`;
const FROM_PARTS = 'from parts p join part_models m on m.part_id = p.id left join part_capacitance c on c.part_id = p.id';

/**
 * One part read straight from the database, built exactly as the cache builds it (null
 * when it has no model), for exports that must not wait for the next notification.
 * @throws RangeError when its stored model is unusable.
 */
export async function loadPart(sql: Sql, id: number): Promise<CachedPart | null> {
	const rows = (await sql.unsafe(`select ${SELECT_COLUMNS} ${FROM_PARTS} where p.id = $1`, [
		id
	])) as unknown as Row[];
	return rows.length ? partFromRow(rows[0]) : null;
}

export type ModelCacheOptions = {
	/** Delay between a notification and the rebuild, gathering bursts into one [ms]. */
	rebuildDelayMs?: number;
	/** Called when a part's stored model cannot be turned into an engine model. */
	onSkip?: (partId: number, reason: string) => void;
	/**
	 * Opens a connection used only to listen. Given, a listener that stopped hearing is
	 * replaced by a new one; without it the query client listens and is only re-asked.
	 */
	listener?: () => Sql;
	/** How often the cache checks that it still hears its channel [ms]; 0 turns it off. */
	hearingCheckMs?: number;
};

export class ModelCache {
	private byId = new Map<number, CachedPart>();
	private snap: CacheSnapshot = new CacheSnapshot([]);
	private loading: Promise<void> | null = null;
	private rebuildTimer: ReturnType<typeof setTimeout> | null = null;
	private pendingIds = new Set<number>();
	private unlisten: (() => Promise<void>) | null = null;
	private unlistenProjects: (() => Promise<void>) | null = null;
	private listenSql: Sql | null = null;
	private hearingTimer: ReturnType<typeof setInterval> | null = null;
	private readonly pingPrefix = `ping:${randomBytes(6).toString('hex')}:`;
	private pingSent = 0;
	private pingHeard = 0;
	/** Set when a re-read failed: the next hearing check starts over. */
	private stale = false;
	private checking = false;
	/** Called after every rebuild with the parts it re-read (null: all of them). */
	private listeners = new Set<(partIds: number[] | null) => void>();
	/** Called with each changed project's id (null: any may have changed while not listening). */
	private projectListeners = new Set<(projectId: number | null) => void>();
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
		if (!this.unlisten) await this.listen();
		await this.reloadAll();
		const every = this.options.hearingCheckMs ?? 3000;
		if (every > 0 && !this.hearingTimer) {
			this.hearingTimer = setInterval(() => void this.checkHearing(), every);
			this.hearingTimer.unref?.();
		}
	}

	/** Starts listening; onlisten runs again on every reconnection of that connection. */
	private async listen(): Promise<void> {
		let first = true;
		this.listenSql = this.options.listener?.() ?? this.sql;
		const meta = await this.listenSql.listen(
			MODEL_CHANNEL,
			(payload) => this.changed(payload),
			() => {
				if (first) {
					first = false;
					return;
				}
				this.reloadAllSoon();
			}
		);
		this.unlisten = meta.unlisten;
		let firstProjects = true;
		const projects = await this.listenSql.listen(
			PROJECT_CHANNEL,
			(payload) => {
				const id = Number(payload);
				if (Number.isInteger(id) && id > 0) this.projectChanged(id);
			},
			() => {
				if (firstProjects) firstProjects = false;
				else this.projectChanged(null);
			}
		);
		this.unlistenProjects = projects.unlisten;
	}

	private projectChanged(id: number | null): void {
		for (const l of [...this.projectListeners]) l(id);
	}

	/**
	 * One tick of the hearing check: if the last ping went out but never came back, the
	 * listener is deaf — replace it and re-read everything; then send the next ping.
	 */
	private async checkHearing(): Promise<void> {
		if (this.checking) return;
		this.checking = true;
		try {
			if (this.pingSent > this.pingHeard || this.stale) {
				const old = this.listenSql;
				this.unlisten = null;
				this.unlistenProjects = null;
				this.listenSql = null;
				if (old && old !== this.sql) await old.end({ timeout: 0 }).catch(() => {});
				await this.listen();
				await this.reloadAll();
				this.projectChanged(null);
				this.stale = false;
				this.pingHeard = this.pingSent;
			}
			this.pingSent += 1;
			await this.sql`select pg_notify(${MODEL_CHANNEL}, ${this.pingPrefix + this.pingSent})`;
		} catch {
			// The database is unavailable: the next tick tries again.
		} finally {
			this.checking = false;
		}
	}

	/** Re-reads everything in the background; a failure is retried by the hearing check. */
	private reloadAllSoon(): void {
		this.reloadAll().catch(() => {
			this.stale = true;
		});
	}

	/** Re-reads every part and rebuilds the table now. */
	async reloadAll(): Promise<void> {
		const rows = (await this.sql.unsafe(
			`select ${SELECT_COLUMNS} ${FROM_PARTS} order by p.id`
		)) as unknown as Row[];
		const next = new Map<number, CachedPart>();
		this.skipped.clear();
		for (const row of rows) {
			const part = this.tryBuild(row);
			if (part) next.set(part.id, part);
		}
		this.byId = next;
		this.rebuild(null);
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
		if (payload.startsWith('ping:')) {
			if (payload.startsWith(this.pingPrefix)) this.pingHeard = Math.max(this.pingHeard, Number(payload.slice(this.pingPrefix.length)));
			return;
		}
		const id = Number(payload);
		if (!Number.isInteger(id) || id <= 0) return;
		this.pendingIds.add(id);
		if (this.rebuildTimer) return;
		this.rebuildTimer = setTimeout(() => {
			this.rebuildTimer = null;
			// Lost to an outage: the listener reconnects (or the hearing check notices) and
			// re-reads everything, these parts included.
			this.applyPending().catch(() => {
				this.stale = true;
			});
		}, this.options.rebuildDelayMs ?? 25);
	}

	private async applyPending(): Promise<void> {
		const ids = [...this.pendingIds];
		this.pendingIds.clear();
		if (ids.length === 0) return;
		const rows = (await this.sql.unsafe(
			`select ${SELECT_COLUMNS} ${FROM_PARTS} where p.id = any($1::int[])`,
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
		this.rebuild(ids);
	}

	private rebuild(partIds: number[] | null): void {
		const parts = [...this.byId.values()].sort((a, b) => a.id - b.id);
		this.snap = new CacheSnapshot(parts);
		this.generation++;
		for (const l of [...this.listeners]) l(partIds);
	}

	/**
	 * Calls `listener` after every rebuild with the ids of the parts re-read (null after a
	 * full re-read: any part may have changed). Returns the function that stops it.
	 */
	onRebuild(listener: (partIds: number[] | null) => void): () => void {
		this.listeners.add(listener);
		return () => this.listeners.delete(listener);
	}

	/** Calls `listener` with the id of every project whose change has committed. */
	onProjectChange(listener: (projectId: number | null) => void): () => void {
		this.projectListeners.add(listener);
		return () => this.projectListeners.delete(listener);
	}

	/** How many rebuild and project listeners are attached (clean-up checks). */
	get listenerCount(): number {
		return this.listeners.size + this.projectListeners.size;
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
		if (this.hearingTimer) clearInterval(this.hearingTimer);
		this.hearingTimer = null;
		await this.unlisten?.();
		await this.unlistenProjects?.();
		this.unlisten = null;
		this.unlistenProjects = null;
		if (this.listenSql && this.listenSql !== this.sql) await this.listenSql.end({ timeout: 1 });
		this.listenSql = null;
	}
}

let shared: ModelCache | null = null;
/**
 * Made once, before the first await: requests arriving together at a cold start must share
 * one cache (each one made its own before: a full load, a listener and a hearing check each).
 */
let creating: Promise<ModelCache> | null = null;

/** This process's cache over the app's database pool, ready to use. */
export async function modelCache(): Promise<ModelCache> {
	creating ??= import('./db').then(
		({ client, listeningClient }) =>
			(shared = new ModelCache(client, {
				onSkip: (id, reason) => console.warn(`model cache: part ${id} left out: ${reason}`),
				listener: listeningClient
			}))
	);
	const cache = await creating;
	await cache.ready();
	return cache;
}

/** Stops this process's cache listening (server shutdown), so the process can exit. */
export async function closeModelCache(): Promise<void> {
	await shared?.close();
}
