// A part's junction capacitance (part_capacitance): the median over its samples' C–V fits
// when it has active C–V runs, else a given card's CJO/VJ/M, else none. Rebuilt inside the
// transaction that rebuilds the part's model (part-models.ts), which then carries it into
// every sample model so rankings, limits and the protected node all use the same values.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { median } from 'simple-statistics';
import { SPICE_DEFAULTS } from '$lib/junction';
import { capacitanceAt, measuredCapacitance, type CapacitanceModel, type PartCapacitance, type SampleCapacitance } from '$lib/catalogue/capacitance';
import type { DbOrTx } from './db';
import { fits, partCapacitance, runs, samples, type StoredModel } from './db/schema';

/** The C–V run temperature each sample is represented by: the one nearest SPICE's TNOM default. */
const NOMINAL_C = 27;

/** Each sample's C–V fit from its active run nearest 27 °C (earliest on ties), by sample id. */
async function sampleFits(tx: DbOrTx, partId: number): Promise<SampleCapacitance[]> {
	const rows = await tx
		.select({ sampleId: fits.sampleId, unit: samples.unit, runId: fits.runId, model: fits.model, temperatureC: runs.temperatureC })
		.from(fits)
		.innerJoin(runs, eq(runs.id, fits.runId))
		.innerJoin(samples, eq(samples.id, fits.sampleId))
		.where(and(eq(fits.partId, partId), isNull(fits.supersededAt), eq(runs.state, 'active'), eq(runs.measurement, 'cv')))
		.orderBy(asc(fits.runId));
	const bySample = new Map<number, SampleCapacitance & { dist: number }>();
	for (const r of rows) {
		const m = r.model as CapacitanceModel;
		const dist = Math.abs(r.temperatureC - NOMINAL_C);
		const cur = bySample.get(r.sampleId);
		if (!cur || dist < cur.dist)
			bySample.set(r.sampleId, { sampleId: r.sampleId, unit: r.unit, runId: r.runId, CJO: m.CJO, VJ: m.VJ, M: m.M, FC: m.FC, temperatureC: m.TNOM, dist });
	}
	return [...bySample.values()].sort((a, b) => a.sampleId - b.sampleId).map(({ dist: _, ...s }) => s);
}

/** The capacitance a given card states, at the card's TNOM; null without CJO. */
function givenCapacitance(given: StoredModel | null): PartCapacitance | null {
	if (!given?.CJO) return null;
	const typical = { CJO: given.CJO, VJ: given.VJ ?? SPICE_DEFAULTS.VJ, M: given.M ?? SPICE_DEFAULTS.M, FC: given.FC ?? SPICE_DEFAULTS.FC, TNOM: given.TNOM ?? SPICE_DEFAULTS.TNOM };
	return { source: 'given', typical, spread: {}, samples: [] };
}

/**
 * Writes (or removes) the part's capacitance row and returns it. Measured parameters are
 * stated at `tnomC`, the TNOM of the part's Shockley model (SPICE keeps one TNOM per card);
 * without one (null), at the median temperature of the C–V runs, so nothing is scaled.
 */
export async function rebuildPartCapacitance(tx: DbOrTx, partId: number, given: StoredModel | null, tnomC: number | null): Promise<PartCapacitance | null> {
	const measured = await sampleFits(tx, partId);
	const at = (s: SampleCapacitance[]) => tnomC ?? Math.round(median(s.map((x) => x.temperatureC)) * 100) / 100;
	const cap = measured.length ? measuredCapacitance(measured, at(measured)) : givenCapacitance(given);
	if (!cap) {
		await tx.delete(partCapacitance).where(eq(partCapacitance.partId, partId));
		return null;
	}
	const row = { source: cap.source, typical: cap.typical, spread: cap.spread, samples: cap.samples, updatedAt: new Date() };
	await tx.insert(partCapacitance).values({ partId, ...row }).onConflictDoUpdate({ target: partCapacitance.partId, set: row });
	return cap;
}

/**
 * A stored model with the part's capacitance in it (CJO, VJ, M, FC at the model's own TNOM),
 * or without any when the part has none: one capacitance per part, whatever the sample.
 */
export function withCapacitance(m: StoredModel, cap: PartCapacitance | null): StoredModel {
	const { CJO: _c, VJ: _v, M: _m, FC: _f, ...rest } = m;
	if (!cap) return rest;
	const at = capacitanceAt(cap.typical, m.TNOM ?? SPICE_DEFAULTS.TNOM);
	return { ...rest, CJO: at.CJO, VJ: at.VJ, M: at.M, FC: at.FC };
}
