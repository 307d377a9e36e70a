// Rebuilds a part's aggregate model row (part_models) from its active I–V runs' current fits,
// or its given model, with the part's capacitance (part-capacitance.ts: its C–V runs, else the
// given card) in every sample model. Called inside the transaction that changed a fit, a run's
// state, a sample or the given model.
import { and, asc, eq, isNull, sql } from 'drizzle-orm';
import { median } from 'simple-statistics';
import type { DbOrTx } from './db';
import { fits, partModels, parts, runs, samples, type FitQuality, type FitRange, type StoredModel, type SweepDirection } from './db/schema';
import { notifyModelChanged } from './model-events';
import { currentMagnitude, LEAKAGE_PROBE } from '$lib/catalogue/models';
import type { Material } from '$lib/catalogue/vocabulary';
import { rebuildPartCapacitance, withCapacitance } from './part-capacitance';

/** The run temperature each sample is represented by: the one nearest SPICE's TNOM default. */
export const NOMINAL_C = 27;

type IvFitRow = { sampleId: number; unit: string; model: StoredModel; quality: FitQuality; range: FitRange; temperatureC: number; direction: SweepDirection };

type SampleFit = { sampleId: number; unit: string; model: StoredModel; rms: number };

/** Median of every parameter over samples (each parameter on its own), and min–max spread. */
export function aggregate(models: StoredModel[]): { typical: StoredModel; spread: Record<string, [number, number]> } {
	const keys = new Set<string>();
	for (const m of models) for (const k of Object.keys(m)) keys.add(k);
	const typical: Record<string, number> = {};
	const spread: Record<string, [number, number]> = {};
	for (const k of keys) {
		const vals = models.map((m) => (m as Record<string, number | undefined>)[k]).filter((v): v is number => typeof v === 'number');
		if (vals.length === 0) continue;
		// RSH (and other optional parts) only when most samples have them: a median over a minority misleads.
		if (k !== 'IS' && k !== 'N' && vals.length * 2 < models.length) continue;
		typical[k] = median(vals);
		spread[k] = [Math.min(...vals), Math.max(...vals)];
	}
	return { typical: typical as StoredModel, spread };
}

/** A part's current fits of active I–V runs with what the aggregate needs of their runs and samples, oldest run first. */
async function fitRows(tx: DbOrTx, partId: number): Promise<IvFitRow[]> {
	// Only I–V fits (the filter below), so their model, quality and range are the Shockley shapes.
	return (await tx
		.select({
			sampleId: fits.sampleId,
			unit: samples.unit,
			model: fits.model,
			quality: fits.quality,
			range: fits.range,
			temperatureC: runs.temperatureC,
			direction: runs.direction
		})
		.from(fits)
		.innerJoin(runs, eq(runs.id, fits.runId))
		.innerJoin(samples, eq(samples.id, fits.sampleId))
		// Each active run's current fit: withdrawn runs and superseded fit versions stay on record but out of the model.
		.where(and(eq(fits.partId, partId), isNull(fits.supersededAt), eq(runs.state, 'active'), eq(runs.measurement, 'iv')))
		.orderBy(asc(fits.runId))) as IvFitRow[];
}

/** Per sample: the fit of its run nearest the nominal temperature (earliest on ties), by sample id. */
function representativeFits(rows: IvFitRow[]): SampleFit[] {
	const bySample = new Map<number, SampleFit & { dist: number }>();
	for (const r of rows) {
		const dist = Math.abs(r.temperatureC - NOMINAL_C);
		const cur = bySample.get(r.sampleId);
		if (!cur || dist < cur.dist) bySample.set(r.sampleId, { sampleId: r.sampleId, unit: r.unit, model: r.model, rms: r.quality.rmsResidualV, dist });
	}
	return [...bySample.values()].sort((a, b) => a.sampleId - b.sampleId);
}

/**
 * Fills in the sample units of measured parts stored before units were kept (their
 * sample_units empty), from the same choice of fits; models and versions stay as they are.
 * Returns how many parts it filled.
 */
async function backfillSampleUnits(tx: DbOrTx): Promise<number> {
	const stale = await tx
		.select({ partId: partModels.partId })
		.from(partModels)
		.where(sql`${partModels.isMeasured} and jsonb_array_length(${partModels.sampleUnits}) <> ${partModels.sampleCount}`);
	for (const { partId } of stale) {
		const units = representativeFits(await fitRows(tx, partId)).map((f) => f.unit);
		await tx.update(partModels).set({ sampleUnits: units }).where(eq(partModels.partId, partId));
		await notifyModelChanged(tx, partId);
	}
	return stale.length;
}

/**
 * Writes (or removes) the part_models row and bumps parts.modelVersion, then announces
 * the change. Returns the new version, or null when the part has no model at all.
 */
export async function rebuildPartModel(tx: DbOrTx, partId: number): Promise<number | null> {
	const [part] = await tx
		.update(parts)
		.set({ modelVersion: sql`${parts.modelVersion} + 1` })
		.where(eq(parts.id, partId))
		.returning();
	if (!part) return null;
	const rows = await fitRows(tx, partId);
	const version = part.modelVersion;
	const material = part.material as Material;

	if (rows.length === 0) {
		const cap = await rebuildPartCapacitance(tx, partId, part.givenModel, part.givenModel ? (part.givenModel.TNOM ?? NOMINAL_C) : null);
		if (!part.givenModel) {
			await tx.delete(partModels).where(eq(partModels.partId, partId));
			await notifyModelChanged(tx, partId);
			return cap ? version : null;
		}
		const given = withCapacitance(part.givenModel, cap);
		const row = {
			typical: given,
			worst: given,
			sampleModels: [given],
			sampleUnits: [],
			spread: {},
			measured: { minCurrentA: null, temperaturesC: [], reverseMeasured: false, worstRmsResidualV: null },
			sampleCount: 0,
			isMeasured: false,
			version
		};
		await tx.insert(partModels).values({ partId, ...row }).onConflictDoUpdate({ target: partModels.partId, set: row });
		await notifyModelChanged(tx, partId);
		return version;
	}

	const sampleFits = representativeFits(rows);
	const sampleUnits = sampleFits.map((s) => s.unit);
	const fitted = aggregate(sampleFits.map((s) => s.model));
	const cap = await rebuildPartCapacitance(tx, partId, part.givenModel, fitted.typical.TNOM ?? NOMINAL_C);
	const sampleModels = sampleFits.map((s) => withCapacitance(s.model, cap));
	const typical = withCapacitance(fitted.typical, cap);
	const spread = fitted.spread;
	let worst = sampleModels[0];
	let worstLeak = -Infinity;
	for (const m of sampleModels) {
		const leak = currentMagnitude(m, material, LEAKAGE_PROBE.biasV, LEAKAGE_PROBE.temperatureC);
		if (leak > worstLeak) (worst = m), (worstLeak = leak);
	}
	const mins = rows.map((r) => r.range.minAbsCurrentA ?? r.range.currentA[0]).filter((x) => x > 0);
	const measured = {
		minCurrentA: mins.length ? Math.min(...mins) : null,
		temperaturesC: [...new Set(rows.map((r) => Math.round(r.temperatureC * 10) / 10))].sort((a, b) => a - b),
		reverseMeasured: rows.some((r) => r.direction !== 'forward' || r.range.reverseMeasured === true),
		worstRmsResidualV: Math.max(...rows.map((r) => r.quality.rmsResidualV))
	};
	const row = { typical, worst, sampleModels, sampleUnits, spread, measured, sampleCount: sampleModels.length, isMeasured: true, version };
	await tx.insert(partModels).values({ partId, ...row }).onConflictDoUpdate({ target: partModels.partId, set: row });
	await notifyModelChanged(tx, partId);
	return version;
}

/**
 * Rebuilds the parts stored before capacitance was kept: those with a card's CJO, or with
 * active C–V runs, but no part_capacitance row. Returns how many it rebuilt.
 */
async function backfillCapacitance(tx: DbOrTx): Promise<number> {
	const stale = await tx
		.select({ id: parts.id })
		.from(parts)
		.where(
			sql`not exists (select 1 from part_capacitance c where c.part_id = ${parts.id})
				and (coalesce((${parts.givenModel}->>'CJO')::float8, 0) > 0
					or exists (select 1 from runs r where r.part_id = ${parts.id} and r.measurement = 'cv' and r.state = 'active'))`
		);
	for (const { id } of stale) await rebuildPartModel(tx, id);
	return stale.length;
}

/** Parts filled in after the migrations by `fillAfterMigrations`, per step. */
export type MigrationFills = { capacitance: number; sampleUnits: number };

/**
 * What the migrations leave to the app's own code, in the caller's transaction: parts stored
 * before their capacitance was kept are rebuilt once (which also stores their sample units),
 * then measured parts still without sample units get them.
 */
export async function fillAfterMigrations(tx: DbOrTx): Promise<MigrationFills> {
	const capacitance = await backfillCapacitance(tx);
	const sampleUnits = await backfillSampleUnits(tx);
	return { capacitance, sampleUnits };
}
