// Invented catalogue parts for the ranking tests: parts + part_models rows written
// directly (as the catalogue would after fitting), announced on the model channel.
import { inArray } from 'drizzle-orm';
import { expect } from 'vitest';
import type { RankOperatingPoint, RankResponse } from '../../src/lib/schemas/rank';
import { db } from '../../src/lib/server/db';
import { partModels, parts, type StoredModel } from '../../src/lib/server/db/schema';
import { notifyModelChanged } from '../../src/lib/server/model-events';
import { api } from './helpers';

export type TestPart = {
	partNumber: string;
	maker?: string;
	kind?: 'diode' | 'schottky' | 'bjt-be' | 'bjt-diode' | 'jfet-gate' | 'led';
	package?: string;
	material?: 'silicon' | 'metal-semiconductor' | 'germanium' | 'wide-gap';
	admitsLight?: boolean;
	lifecycle?: 'in-use' | 'not-for-new' | 'retired';
	ratedReverseV?: number | null;
	ratedForwardA?: number | null;
	shuntFactorPer10K?: number;
	/** Each sample's unit label (default: none stored, so the app numbers them #1, #2 …). */
	sampleUnits?: string[];
	tags?: string[];
	/** One model per sample (the first is also stored as typical unless `typical` is given). */
	samples: StoredModel[];
	typical?: StoredModel;
	measured?: { minCurrentA: number | null; temperaturesC: number[]; reverseMeasured: boolean; worstRmsResidualV: number | null };
};

/** A well-measured part: leakage measured to 1 fA at 25, 85 and 125 °C, a good fit. */
export const WELL_MEASURED = { minCurrentA: 1e-15, temperaturesC: [-40, 25, 85, 125], reverseMeasured: true, worstRmsResidualV: 5e-4 };

export async function createParts(list: TestPart[]): Promise<number[]> {
	return db.transaction(async (tx) => {
		const ids: number[] = [];
		for (const p of list) {
			const [row] = await tx
				.insert(parts)
				.values({
					partNumber: p.partNumber,
					maker: p.maker ?? 'Fenwick Semiconductor',
					kind: p.kind ?? 'diode',
					package: p.package ?? 'SOD-323',
					material: p.material ?? 'silicon',
					admitsLight: p.admitsLight ?? false,
					lifecycle: p.lifecycle ?? 'in-use',
					ratedReverseV: p.ratedReverseV === undefined ? 30 : p.ratedReverseV,
					ratedForwardA: p.ratedForwardA ?? null,
					...(p.shuntFactorPer10K !== undefined ? { shuntFactorPer10K: p.shuntFactorPer10K } : {}),
					tags: p.tags ?? []
				})
				.returning({ id: parts.id });
			await tx.insert(partModels).values({
				partId: row.id,
				typical: p.typical ?? p.samples[0],
				sampleModels: p.samples,
				sampleUnits: p.sampleUnits ?? [],
				measured: p.measured ?? WELL_MEASURED,
				sampleCount: p.samples.length,
				isMeasured: (p.measured ?? WELL_MEASURED).minCurrentA !== null,
				version: 1
			});
			await notifyModelChanged(tx, row.id);
			ids.push(row.id);
		}
		return ids;
	});
}

export async function deleteParts(ids: number[]) {
	if (ids.length === 0) return;
	await db.transaction(async (tx) => {
		await tx.delete(parts).where(inArray(parts.id, ids));
		for (const id of ids) await notifyModelChanged(tx, id);
	});
}

/** POST /api/v1/rank as a designer (up to 1000 items unless the body says otherwise), expecting 200. */
export async function rank(body: RankOperatingPoint & { limit?: number; withSamples?: boolean }): Promise<RankResponse> {
	const r = await api<RankResponse>('POST', '/api/v1/rank', { as: 'designer', json: { limit: 1000, ...body } });
	expect(r.status, JSON.stringify(r.body)).toBe(200);
	return r.body;
}

/** Waits until the server's model cache (another process, fed by NOTIFY) lists n parts for q. */
export async function seen(q: string, n: number): Promise<void> {
	for (let i = 0; i < 100; i++) {
		const r = await rank({ biasV: -1, temperatureC: 25, q, includeOverRating: true });
		if (r.evaluated === n) return;
		await new Promise((res) => setTimeout(res, 100));
	}
	throw new Error(`the server never saw ${n} parts for '${q}'`);
}
