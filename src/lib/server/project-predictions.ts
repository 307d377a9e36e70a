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
import type { NodeEntryPrediction } from '$lib/schemas/node';
import { predictNode } from './node';

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
		...(r.allowedErrorV !== undefined && r.sourceResistanceOhm ? { allowedErrorV: r.allowedErrorV } : {}),
		...(r.sourceResistanceOhm ? { sourceResistanceOhm: r.sourceResistanceOhm } : {}),
		includeOverRating: true
	};
}

/** What an export needs of a part as it stood: its evidence, the typical model and each sample's model. */
export type PartModels = {
	evidence: 'measured' | 'given';
	givenSource: string | null;
	typical: ModelRecord;
	samples: { unit: string; model: ModelRecord }[];
};

/** The record of an engine model: every parameter createModel needs to rebuild it. */
function modelRecordOf(m: JunctionModel): ModelRecord {
	const input: Record<string, number> = {};
	for (const k of ['IS', 'N', 'RS', 'RSH', 'ISR', 'NR', 'BV', 'IBV', 'NBV', 'EG', 'XTI', 'TNOM', 'CJO', 'VJ', 'M', 'FC', 'shuntFactorPer10K'] as const) {
		const v = m[k];
		if (typeof v === 'number') input[k] = v;
	}
	return { input, material: m.material };
}

/**
 * Predictions and models from one cache snapshot: `models` holds each part's typical
 * model, `parts` also every sample's, and (when the requirement holds a node) `nodes` each
 * part's figures in the node. Parts without a usable model are absent.
 */
export async function predictEntries(
	partIds: number[],
	requirement: Requirement
): Promise<{
	predictions: Map<number, Prediction>;
	models: Map<number, ModelRecord>;
	parts: Map<number, PartModels>;
	nodes: Map<number, NodeEntryPrediction>;
}> {
	const cache = await modelCache();
	const snap = cache.snapshot;
	const models = new Map<number, ModelRecord>();
	const parts = new Map<number, PartModels>();
	for (const id of partIds) {
		const k = snap.indexOf.get(id);
		if (k === undefined) continue;
		const part = snap.parts[k];
		const typical = modelRecordOf(part.typicalModel);
		models.set(id, typical);
		parts.set(id, {
			evidence: part.evidence,
			givenSource: part.givenSource,
			typical,
			samples: part.evidence === 'measured' ? part.record.samples.map((m, i) => ({ unit: part.sampleUnits[i], model: modelRecordOf(m) })) : []
		});
	}
	// Passing the cache reads the same snapshot synchronously.
	const predictions = await predictParts(partIds, toOperatingPoint(requirement), cache);
	const nodes = requirement.node ? predictNode(requirement.node, partIds, snap) : new Map<number, NodeEntryPrediction>();
	return { predictions, models, parts, nodes };
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
