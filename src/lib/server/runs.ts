// Measurement intake: a sweep (CSV bytes or a list of points, I–V or C–V) is checked,
// parsed and fitted by the engine before anything is written (run-intake.ts); then the run,
// its fit, the part's aggregate model and an audit row are written in one transaction.
import { and, eq } from 'drizzle-orm';
import type { Material } from '$lib/catalogue/vocabulary';
import type { Measurement } from '$lib/catalogue/capacitance';
import { DomainError, type Issue } from './errors';
import { recordAudit } from './audit';
import { db, type Tx } from './db';
import { fits, parts, runs, samples, type SweepDirection } from './db/schema';
import { rebuildPartModel } from './part-models';
import { uniqueViolation } from './catalogue';
import { prepare, type PreparedRun, type RunSettings, type SweepSource } from './run-intake';

export { UPLOAD_LIMIT_BYTES, prepare, pointsToCsv, fitParsed, parseSweepBytes } from './run-intake';
export type { SweepSource, StoredFit, StoredCvFit, PreparedRun, RunSettings } from './run-intake';

async function duplicateOf(sha: string) {
	const [dup] = await db
		.select({ id: runs.id, fileName: runs.fileName, createdAt: runs.createdAt, partNumber: parts.partNumber, unit: samples.unit, partId: parts.id, state: runs.state })
		.from(runs)
		.innerJoin(parts, eq(parts.id, runs.partId))
		.innerJoin(samples, eq(samples.id, runs.sampleId))
		.where(eq(runs.fileSha256, sha))
		.limit(1);
	return dup ?? null;
}

function duplicateError(dup: NonNullable<Awaited<ReturnType<typeof duplicateOf>>>): DomainError {
	return new DomainError(
		409,
		`This exact file was already uploaded as run ${dup.id} (“${dup.fileName}”, ${dup.partNumber} sample ${dup.unit}, ${dup.createdAt.toISOString().slice(0, 10)})${
			dup.state === 'withdrawn' ? ' and later withdrawn; put that run back into the model from its page instead' : ''
		}. Nothing was stored.`,
		[{ path: 'file', message: `same SHA-256 as run ${dup.id}` }]
	);
}

export type IngestInput = RunSettings & {
	partId: number;
	sample: string;
	source: SweepSource;
	/** Parse and fit only: nothing is written (the upload page's preview fit). */
	dryRun?: boolean;
};

export type IngestResult = {
	id: number | null;
	partId: number;
	sample: string;
	measurement: Measurement;
	fileName: string;
	sha256: string;
	temperatureC: number;
	direction: SweepDirection;
	/** C–V runs: the test-signal frequency [Hz] and level [V], when known. */
	frequencyHz?: number | null;
	testLevelV?: number | null;
	pointCount: number;
	points: [number, number][];
	columns: PreparedRun['columns'];
	fit: PreparedRun['fit'];
	warnings: Issue[];
	modelVersion: number | null;
	stored: boolean;
};

/** The run's row and its fit's row, as one prepared sweep gives them. */
function rowsOf(p: PreparedRun) {
	const cv = p.measurement === 'cv';
	return {
		run: { measurement: p.measurement, frequencyHz: cv ? p.frequencyHz : null, testLevelV: cv ? p.testLevelV : null },
		fit: cv ? { ...p.fit } : { ...p.fit, strayCapacitanceF: null }
	};
}

/** The part's sample with this unit label, created (with its audit row) when it is new. */
async function sampleFor(tx: Tx, partId: number, unit: string, actor: { id: string } | null) {
	const find = async () => (await tx.select().from(samples).where(and(eq(samples.partId, partId), eq(samples.unit, unit))))[0];
	const found = await find();
	if (found) return found;
	// Two files of one new sample arrive together in a campaign: the first creates it,
	// the other waits for that and uses it.
	const [created] = await tx.insert(samples).values({ partId, unit }).onConflictDoNothing({ target: [samples.partId, samples.unit] }).returning();
	if (!created) return (await find())!;
	await recordAudit(tx, { actorId: actor?.id ?? null, action: 'sample.create', entity: 'sample', entityId: created.id, detail: { partId, unit } });
	return created;
}

/**
 * Ingests one run for a part: the same path for uploads, API calls and the demo seed.
 * A refused run writes nothing. @throws DomainError 404/409/413/422.
 */
export async function ingest(actor: { id: string } | null, input: IngestInput): Promise<IngestResult> {
	const [part] = await db.select().from(parts).where(eq(parts.id, input.partId));
	if (!part) throw new DomainError(404, `No part ${input.partId}.`);
	const unit = input.sample.trim();
	if (!/^[\w.#/-]{1,40}$/.test(unit)) throw new DomainError(400, 'The sample label is letters, digits and . # / - (1–40 characters).', [{ path: 'sample', message: 'invalid sample label' }]);
	const { temperatureC, excludedV, measurement, frequencyHz, testLevelV, strayCapacitanceF } = input;
	const settings: RunSettings = { temperatureC, excludedV, measurement, frequencyHz, testLevelV, strayCapacitanceF };
	const prepared = prepare(input.source, settings, { material: part.material as Material, given: part.givenModel });
	const dup = await duplicateOf(prepared.sha256);
	if (dup) throw duplicateError(dup);
	const base = {
		partId: part.id,
		sample: unit,
		measurement: prepared.measurement,
		...(prepared.measurement === 'cv' ? { frequencyHz: prepared.frequencyHz, testLevelV: prepared.testLevelV } : {}),
		fileName: prepared.fileName,
		sha256: prepared.sha256,
		temperatureC: prepared.temperatureC,
		direction: prepared.direction,
		pointCount: prepared.points.length,
		points: prepared.points,
		columns: prepared.columns,
		fit: prepared.fit,
		warnings: prepared.warnings
	};
	if (input.dryRun) return { ...base, id: null, modelVersion: null, stored: false };
	const rows = rowsOf(prepared);
	try {
		return await db.transaction(async (tx) => {
			const sample = await sampleFor(tx, part.id, unit, actor);
			const [run] = await tx
				.insert(runs)
				.values({
					partId: part.id,
					sampleId: sample.id,
					temperatureC: prepared.temperatureC,
					direction: prepared.direction,
					fileName: prepared.fileName,
					fileBytes: prepared.bytes,
					fileSha256: prepared.sha256,
					points: prepared.points,
					...rows.run,
					uploadedBy: actor?.id ?? null
				})
				.returning({ id: runs.id });
			await tx.insert(fits).values({ runId: run.id, partId: part.id, sampleId: sample.id, ...rows.fit, fittedBy: actor?.id ?? null });
			const modelVersion = await rebuildPartModel(tx, part.id);
			await recordAudit(tx, {
				actorId: actor?.id ?? null,
				action: 'run.ingest',
				entity: 'run',
				entityId: run.id,
				detail: {
					partId: part.id,
					sample: unit,
					measurement: prepared.measurement,
					fileName: prepared.fileName,
					sha256: prepared.sha256,
					temperatureC: prepared.temperatureC,
					excludedV: prepared.fit.excludedV,
					...(prepared.measurement === 'cv' ? { frequencyHz: prepared.frequencyHz, testLevelV: prepared.testLevelV, strayCapacitanceF: prepared.fit.strayCapacitanceF } : {})
				}
			});
			return { ...base, id: run.id, modelVersion, stored: true };
		});
	} catch (e) {
		// Two uploads of one file at once: the unique index decides, the loser is told plainly.
		if (uniqueViolation(e, 'sha256')) {
			const again = await duplicateOf(prepared.sha256);
			if (again) throw duplicateError(again);
		}
		throw e;
	}
}

/** A stored run's original bytes, for download. */
export async function originalFile(partId: number, runId: number) {
	const [row] = await db
		.select({ fileName: runs.fileName, bytes: runs.fileBytes, sha256: runs.fileSha256 })
		.from(runs)
		.where(and(eq(runs.id, runId), eq(runs.partId, partId)));
	return row ?? null;
}
