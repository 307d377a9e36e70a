// Putting a stored run right: withdraw it (or put it back), fit it again with another
// voltage window, or correct its sample or temperature. Each change is one transaction: a
// guarded update of the run (its state and revision, so the loser of a race gets 409), the
// new fit version where there is one (the earlier kept and marked superseded), the part's
// model rebuilt and announced, and an audit row. Nothing is ever deleted.
import { and, desc, eq, isNull, max } from 'drizzle-orm';
import { checkRunAction, type RunAction } from '$lib/run-transitions';
import type { Material } from '$lib/catalogue/vocabulary';
import type { Actor } from '$lib/permissions';
import { DomainError } from './errors';
import { recordAudit } from './audit';
import { db, type DbOrTx } from './db';
import { auditLog, fits, parts, runs, samples, type FitCause } from './db/schema';
import { rebuildPartModel } from './part-models';
import { personRefs } from './people';
import { fitCapacitanceParsed, fitParsed, parseCapacitanceBytes, parseSweepBytes, type StoredCvFit, type StoredFit } from './run-intake';

type Who = NonNullable<Actor>;
type RunRow = typeof runs.$inferSelect;
type FitRow = typeof fits.$inferSelect;
type Loaded = { run: RunRow; part: typeof parts.$inferSelect; unit: string; fit: FitRow | null };

/** What one change writes besides the run's state and revision. */
type Plan = {
	set?: Partial<typeof runs.$inferInsert>;
	/** Move the run to this sample (created when the part has none by that label). */
	sampleUnit?: string;
	/** A new fit version replacing the current one. */
	fit?: { fit: StoredFit | StoredCvFit; cause: FitCause; note: string };
	audit: Record<string, unknown>;
};

async function load(partId: number, runId: number, tx: DbOrTx = db): Promise<Loaded> {
	const [row] = await tx
		.select({ run: runs, part: parts, unit: samples.unit })
		.from(runs)
		.innerJoin(parts, eq(parts.id, runs.partId))
		.innerJoin(samples, eq(samples.id, runs.sampleId))
		.where(and(eq(runs.id, runId), eq(runs.partId, partId)));
	if (!row) throw new DomainError(404, `Part ${partId} has no run ${runId}.`);
	const [fit] = await tx.select().from(fits).where(and(eq(fits.runId, runId), isNull(fits.supersededAt)));
	return { ...row, fit: fit ?? null };
}

async function sampleFor(tx: DbOrTx, actorId: string, partId: number, unit: string): Promise<number> {
	const [made] = await tx.insert(samples).values({ partId, unit }).onConflictDoNothing().returning({ id: samples.id });
	if (made) {
		await recordAudit(tx, { actorId, action: 'sample.create', entity: 'sample', entityId: made.id, detail: { partId, unit } });
		return made.id;
	}
	const [found] = await tx.select({ id: samples.id }).from(samples).where(and(eq(samples.partId, partId), eq(samples.unit, unit)));
	return found.id;
}

/** Why a guarded update changed nothing: someone else changed the run first. */
async function lostRace(tx: DbOrTx, runId: number, action: RunAction): Promise<DomainError> {
	const [now] = await tx.select({ state: runs.state, by: runs.withdrawnBy, at: runs.withdrawnAt }).from(runs).where(eq(runs.id, runId));
	if (now?.state === 'withdrawn') {
		const who = now.by ? ((await personRefs([now.by], tx)).get(now.by)?.name ?? 'someone') : 'someone';
		return new DomainError(409, `The run was withdrawn a moment ago by ${who}; it cannot be ${action === 'withdraw' ? 'withdrawn twice' : 'changed now'}.`);
	}
	return new DomainError(409, 'Someone changed this run a moment ago; reload to see the latest before changing it.');
}

/**
 * Checks the person (403) and the run's state (409), works out the change outside the
 * transaction (fitting can take a moment), then writes it only if nobody changed the run meanwhile.
 */
async function amend(actor: Who, partId: number, runId: number, action: RunAction, plan: (c: Loaded) => Plan) {
	const loaded = await load(partId, runId);
	const check = checkRunAction(actor, action, loaded.run.state);
	if (!check.ok) throw new DomainError(check.status, check.reason);
	const p = plan(loaded);
	const { run } = loaded;
	const modelVersion = await db.transaction(async (tx) => {
		const sampleId = p.sampleUnit ? await sampleFor(tx, actor.id, partId, p.sampleUnit) : run.sampleId;
		const updated = await tx
			.update(runs)
			.set({ ...p.set, sampleId, state: check.to, revision: run.revision + 1 })
			.where(and(eq(runs.id, runId), eq(runs.state, run.state), eq(runs.revision, run.revision)))
			.returning({ id: runs.id });
		if (updated.length !== 1) throw await lostRace(tx, runId, action);
		let fitVersion = loaded.fit?.version ?? null;
		if (p.fit) {
			const [{ last }] = await tx.select({ last: max(fits.version) }).from(fits).where(eq(fits.runId, runId));
			fitVersion = (last ?? 0) + 1;
			await tx.update(fits).set({ supersededAt: new Date() }).where(and(eq(fits.runId, runId), isNull(fits.supersededAt)));
			await tx.insert(fits).values({ runId, partId, sampleId, strayCapacitanceF: null, ...p.fit.fit, version: fitVersion, cause: p.fit.cause, note: p.fit.note, fittedBy: actor.id });
		}
		const version = await rebuildPartModel(tx, partId);
		await recordAudit(tx, { actorId: actor.id, action: `run.${action}`, entity: 'run', entityId: runId, detail: { partId, ...p.audit, fitVersion, modelVersion: version } });
		return version;
	});
	return { ...(await runDetail(partId, runId)), modelVersion };
}

/** The run no longer counts toward its part's model; its file, fits and history stay. */
export function withdraw(actor: Who, partId: number, runId: number, reason: string) {
	return amend(actor, partId, runId, 'withdraw', () => ({
		set: { withdrawnAt: new Date(), withdrawnBy: actor.id, withdrawnReason: reason },
		audit: { reason }
	}));
}

/** A withdrawn run counts again (its current fit as it was). */
export function reinstate(actor: Who, partId: number, runId: number, reason: string) {
	return amend(actor, partId, runId, 'reinstate', (c) => ({
		set: { withdrawnAt: null, withdrawnBy: null, withdrawnReason: null },
		audit: { reason, withdrawnReason: c.run.withdrawnReason }
	}));
}

/** How a stored file is fitted again: the temperature, the window left out, and (C–V) the stray capacitance. */
type RefitSettings = { temperatureC: number; excludedV: [number, number] | null; strayCapacitanceF?: number };

/** Fits the stored file again, as an I–V or a C–V sweep by what the run holds. */
function fitStored(c: Loaded, s: RefitSettings): StoredFit | StoredCvFit {
	if (c.run.measurement === 'cv') {
		const stray = s.strayCapacitanceF ?? c.fit?.strayCapacitanceF ?? 0;
		return fitCapacitanceParsed(parseCapacitanceBytes(c.run.fileBytes, s.temperatureC), { excludedV: s.excludedV, strayCapacitanceF: stray }).fit;
	}
	if (s.strayCapacitanceF !== undefined)
		throw new DomainError(400, 'A stray capacitance belongs to a C–V run; this run is an I–V sweep.', [{ path: 'strayCapacitanceF', message: 'not a C–V run' }]);
	const sweep = parseSweepBytes(c.run.fileBytes, s.temperatureC);
	return fitParsed(sweep, { material: c.part.material as Material, given: c.part.givenModel }, s.excludedV).fit;
}

/** The file's own temperature column, if it has one (then the temperature cannot be corrected). */
function fileTemperatureColumn(c: Loaded, temperatureC: number): string | undefined {
	const bytes = c.run.fileBytes;
	return (c.run.measurement === 'cv' ? parseCapacitanceBytes(bytes, temperatureC) : parseSweepBytes(bytes, temperatureC)).columns.temperature;
}

/** A new fit version of the stored file, leaving out `excludeV` (null: every point); a C–V run may change its stray capacitance. */
export function refit(actor: Who, partId: number, runId: number, input: { excludeV: [number, number] | null; reason: string; strayCapacitanceF?: number }) {
	return amend(actor, partId, runId, 'refit', (c) => {
		const fit = fitStored(c, { temperatureC: c.run.temperatureC, excludedV: input.excludeV, strayCapacitanceF: input.strayCapacitanceF });
		const before = c.fit?.strayCapacitanceF ?? null;
		const stray = input.strayCapacitanceF !== undefined && input.strayCapacitanceF !== before ? { from: { strayCapacitanceF: before }, to: { strayCapacitanceF: input.strayCapacitanceF } } : null;
		return {
			fit: { fit, cause: 'refit', note: input.reason },
			audit: {
				from: { excludedV: c.fit?.excludedV ?? null, ...stray?.from },
				to: { excludedV: input.excludeV, ...stray?.to },
				reason: input.reason
			}
		};
	});
}

/**
 * Records that the run was of another sample or at another temperature. The earlier values
 * stay in the previous fit version and the audit row; a temperature change fits the file again.
 * @throws DomainError 400 when nothing would change, 422 when the file states its own temperature.
 */
export function correct(actor: Who, partId: number, runId: number, input: { sample?: string; temperatureC?: number; reason: string }) {
	return amend(actor, partId, runId, 'correct', (c) => {
		const sample = input.sample !== undefined && input.sample !== c.unit ? input.sample : undefined;
		const temperatureC = input.temperatureC !== undefined && input.temperatureC !== c.run.temperatureC ? input.temperatureC : undefined;
		if (sample === undefined && temperatureC === undefined)
			throw new DomainError(400, `The run is already sample ${c.unit} at ${c.run.temperatureC} °C; nothing to correct.`, [{ path: 'sample', message: 'same sample and temperature as now' }]);
		let fit: StoredFit | StoredCvFit | undefined;
		if (temperatureC !== undefined) {
			const column = fileTemperatureColumn(c, temperatureC);
			if (column)
				throw new DomainError(422, `The file gives its own temperature in the column “${column}”; that cannot be corrected here. Withdraw the run and upload a corrected file.`, [
					{ path: 'temperatureC', column, message: 'the file states the temperature' }
				]);
			fit = fitStored(c, { temperatureC, excludedV: c.fit?.excludedV ?? null });
		} else if (c.fit) {
			const { model, interval, quality, range, excludedV, strayCapacitanceF } = c.fit;
			fit = { model, interval, quality, range, excludedV, strayCapacitanceF } as StoredFit | StoredCvFit;
		}
		return {
			set: temperatureC !== undefined ? { temperatureC } : {},
			sampleUnit: sample,
			fit: fit ? { fit, cause: 'correction', note: input.reason } : undefined,
			audit: {
				from: { sample: c.unit, temperatureC: c.run.temperatureC },
				to: { sample: sample ?? c.unit, temperatureC: temperatureC ?? c.run.temperatureC },
				reason: input.reason
			}
		};
	});
}

export type RunDetail = Awaited<ReturnType<typeof runDetail>>;

/** A run with every fit version (newest first) and its history, as the run page and API show it. */
export async function runDetail(partId: number, runId: number) {
	const { run, part, unit } = await load(partId, runId);
	const versions = await db.select().from(fits).where(eq(fits.runId, runId)).orderBy(desc(fits.version));
	const history = await db
		.select()
		.from(auditLog)
		.where(and(eq(auditLog.entity, 'run'), eq(auditLog.entityId, String(runId))))
		.orderBy(desc(auditLog.at), desc(auditLog.id));
	const refs = await personRefs([run.uploadedBy, run.withdrawnBy, ...versions.map((f) => f.fittedBy), ...history.map((h) => h.actorId)]);
	const name = (id: string | null) => (id ? (refs.get(id)?.name ?? 'someone') : null);
	const present = (f: FitRow) => ({
		id: f.id,
		version: f.version,
		cause: f.cause,
		note: f.note,
		current: f.supersededAt === null,
		model: f.model,
		interval: f.interval,
		quality: f.quality,
		range: f.range,
		excludedV: f.excludedV,
		...(run.measurement === 'cv' ? { strayCapacitanceF: f.strayCapacitanceF ?? 0 } : {}),
		fittedBy: name(f.fittedBy),
		createdAt: f.createdAt,
		supersededAt: f.supersededAt
	});
	const fitVersions = versions.map(present);
	return {
		id: run.id,
		partId,
		partNumber: part.partNumber,
		maker: part.maker,
		sample: unit,
		measurement: run.measurement,
		temperatureC: run.temperatureC,
		direction: run.direction,
		...(run.measurement === 'cv' ? { frequencyHz: run.frequencyHz, testLevelV: run.testLevelV } : {}),
		fileName: run.fileName,
		sha256: run.fileSha256,
		pointCount: run.points.length,
		points: run.points,
		uploadedBy: name(run.uploadedBy),
		createdAt: run.createdAt,
		state: run.state,
		revision: run.revision,
		withdrawn: run.state === 'withdrawn' ? { at: run.withdrawnAt, by: name(run.withdrawnBy), reason: run.withdrawnReason ?? '' } : null,
		fit: fitVersions.find((f) => f.current) ?? null,
		fits: fitVersions,
		history: history.map((h) => ({ at: h.at, by: name(h.actorId) ?? 'someone (since removed)', action: h.action.replace(/^run\./, ''), detail: h.detail })),
		file: `/parts/${partId}/runs/${runId}/file`
	};
}

