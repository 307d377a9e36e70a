// Parts for project tests, written straight into the catalogue tables with a given model
// (invented part numbers and makers), announced to the app's model cache.
import { eq, sql } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { partModels, parts, type StoredModel } from '$lib/server/db/schema';
import { notifyModelChanged } from '$lib/server/model-events';
import { unique } from './helpers';

export async function makePart(opts: { model?: StoredModel; kind?: 'diode' | 'schottky'; ratedReverseV?: number } = {}) {
	const model = opts.model ?? { IS: 2e-15, N: 1.02, RS: 0.8 };
	return db.transaction(async (tx) => {
		const [part] = await tx
			.insert(parts)
			.values({ partNumber: unique('JX').toUpperCase(), maker: 'Quillmark Semi', kind: opts.kind ?? 'diode', givenModel: model, ratedReverseV: opts.ratedReverseV ?? 75 })
			.returning();
		await tx.insert(partModels).values({
			partId: part.id,
			typical: model,
			sampleModels: [model],
			measured: { minCurrentA: null, temperaturesC: [], reverseMeasured: false, worstRmsResidualV: null },
			sampleCount: 1,
			isMeasured: false,
			version: 1
		});
		await notifyModelChanged(tx, part.id);
		return part;
	});
}

/** Replaces a part's model the way the catalogue does: new model, version bumped, announced. */
export async function changeModel(partId: number, model: StoredModel) {
	await db.transaction(async (tx) => {
		await tx.update(parts).set({ givenModel: model, modelVersion: sql`${parts.modelVersion} + 1` }).where(eq(parts.id, partId));
		await tx.update(partModels).set({ typical: model, sampleModels: [model], version: sql`${partModels.version} + 1` }).where(eq(partModels.partId, partId));
		await notifyModelChanged(tx, partId);
	});
}
