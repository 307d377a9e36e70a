/**
 * Predictions for shortlist entries, through the ranking module (one in-memory model
 * cache for the whole app), plus each part's typical model as the numbers came from it,
 * so a review snapshot can reproduce its SPICE cards later.
 */
import { createModel, type JunctionMaterial, type JunctionModel } from '$lib/junction';
import { predictParts, type Prediction } from './ranking';
import { modelCache } from './model-cache';
import type { Requirement } from './db/schema';
import type { RankOperatingPoint } from '$lib/schemas/rank';

export type { Prediction };

/** A typical model with what the engine needs to rebuild it (material, shunt factor, EG). */
export type ModelRecord = { input: Record<string, number>; material: JunctionMaterial };

export function toOperatingPoint(r: Requirement): RankOperatingPoint {
	return {
		biasV: r.biasV,
		...(r.temperatureRangeC ? { temperatureRangeC: r.temperatureRangeC } : { temperatureC: r.temperatureC ?? 25 }),
		...(r.clampCurrentA !== undefined ? { clampCurrentA: r.clampCurrentA } : {}),
		...(r.maxForwardDropV !== undefined ? { maxForwardDropV: r.maxForwardDropV } : {}),
		...(r.leakageTargetA !== undefined ? { leakageTargetA: r.leakageTargetA } : {}),
		...(r.sourceResistanceOhm ? { sourceResistanceOhm: r.sourceResistanceOhm } : {}),
		includeOverRating: true
	};
}

/** Predictions and typical models from one cache snapshot. Parts without a usable model are absent. */
export async function predictEntries(
	partIds: number[],
	requirement: Requirement
): Promise<{ predictions: Map<number, Prediction>; models: Map<number, ModelRecord> }> {
	const cache = await modelCache();
	const snap = cache.snapshot;
	const models = new Map<number, ModelRecord>();
	for (const id of partIds) {
		const k = snap.indexOf.get(id);
		if (k === undefined) continue;
		const part = snap.parts[k];
		const sample = part.record.samples[0];
		models.set(id, {
			input: { ...(part.typical as Record<string, number>), shuntFactorPer10K: sample.shuntFactorPer10K, EG: part.typical.EG ?? sample.EG },
			material: sample.material
		});
	}
	// Passing the cache reads the same snapshot synchronously.
	const predictions = await predictParts(partIds, toOperatingPoint(requirement), cache);
	return { predictions, models };
}

/** The engine model behind a stored record, or null when it no longer validates. */
export function engineModel(m: ModelRecord | null | undefined): JunctionModel | null {
	if (!m) return null;
	try {
		return createModel({ ...m.input, IS: m.input.IS }, m.material);
	} catch {
		return null;
	}
}
