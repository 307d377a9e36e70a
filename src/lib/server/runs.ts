// Measurement intake: a sweep (CSV bytes or a list of points) is checked, parsed and
// fitted by the engine before anything is written; then the run, its fit, the part's
// aggregate model and an audit row are written in one transaction.
import { createHash } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
	FitError,
	SweepError,
	SweepTooLargeError,
	checkSweepSize,
	fitSweep,
	parseSweepCsv,
	type FitResult,
	type ParsedSweep
} from '$lib/junction';
import { egFor, engineMaterial, toStored } from '$lib/catalogue/models';
import type { Material } from '$lib/catalogue/vocabulary';
import { DomainError } from './api';
import { recordAudit } from './audit';
import { db } from './db';
import { fits, parts, runs, samples, type FitInterval, type FitRange, type StoredModel, type SweepDirection } from './db/schema';
import type { Issue } from './http-error';
import { rebuildPartModel } from './part-models';
import { uniqueViolation } from './catalogue';

/** Largest sweep upload accepted [bytes]: bench files are a few kilobytes to a few hundred. */
export const UPLOAD_LIMIT_BYTES = 2 * 1024 * 1024;
/** A file temperature column and a typed temperature may differ by this much [K]. */
const TEMPERATURE_AGREEMENT_K = 1.5;

export type SweepSource =
	| { kind: 'file'; fileName: string; bytes: Uint8Array }
	| { kind: 'points'; fileName?: string; points: { voltageV: number; currentA: number }[] };

export type StoredFit = {
	model: StoredModel;
	interval: FitInterval;
	quality: { points: number; rejected: number; rmsResidualV: number };
	range: FitRange;
	excludedV: [number, number] | null;
};

export type PreparedRun = {
	fileName: string;
	bytes: Buffer;
	sha256: string;
	temperatureC: number;
	direction: SweepDirection;
	/** Merged points as [voltageV, currentA]. */
	points: [number, number][];
	columns: ParsedSweep['columns'];
	fit: StoredFit;
	warnings: Issue[];
};

export type FitContext = { material: Material; given?: StoredModel | null };

function sha256(bytes: Uint8Array): string {
	return createHash('sha256').update(bytes).digest('hex');
}

/** Points (from JSON) written as a CSV file, so they take the same path and are stored as a file. */
export function pointsToCsv(points: { voltageV: number; currentA: number }[]): string {
	return 'V (V),I (A)\n' + points.map((p) => `${p.voltageV},${p.currentA}`).join('\n') + '\n';
}

/** Engine errors → the API's error with issues naming row and column. */
function domainFromEngine(e: unknown): never {
	if (e instanceof SweepTooLargeError)
		throw new DomainError(413, `The file is ${e.sizeBytes} bytes; sweeps up to ${e.limitBytes} bytes are accepted. Nothing was stored.`);
	if (e instanceof SweepError)
		throw new DomainError(422, `The sweep cannot be read: ${e.message.replace(/^sweep rejected: /, '')}. Nothing was stored.`, e.issues);
	if (e instanceof FitError)
		throw new DomainError(422, `The sweep was read but cannot be fitted: ${e.reasons.join('; ')}. Nothing was stored.`, e.reasons.map((message) => ({ message })));
	if (e instanceof RangeError) throw new DomainError(422, `The sweep cannot be fitted: ${e.message}. Nothing was stored.`);
	throw e;
}

/** The engine's fit of a parsed single-temperature sweep, in the stored shape. */
export function fitParsed(sweep: ParsedSweep, ctx: FitContext, excludedV: [number, number] | null = null): { fit: StoredFit; result: FitResult } {
	let result: FitResult;
	try {
		result = fitSweep(sweep, {
			...(excludedV ? { excludeV: excludedV } : {}),
			material: engineMaterial(ctx.material),
			EG: egFor(ctx.material, ctx.given)
		});
	} catch (e) {
		domainFromEngine(e);
	}
	const interval: FitInterval = { IS: result.interval.IS, N: result.interval.N, RS: result.interval.RS };
	if (result.interval.RSH) interval.RSH = result.interval.RSH;
	const t = result.range.temperatureC;
	return {
		result,
		fit: {
			model: toStored(result.model),
			interval,
			quality: result.quality,
			range: {
				currentA: result.range.currentA,
				voltageV: result.range.voltageV,
				temperatureC: typeof t === 'number' ? t : t[0],
				minAbsCurrentA: result.range.minAbsCurrentA,
				reverseMeasured: result.range.reverseMeasured
			},
			excludedV
		}
	};
}

/**
 * Reads sweep bytes (UTF-8 CSV) holding one temperature, at the typed temperature when the
 * file has no temperature column. The same reading serves uploads and later re-fits of the
 * stored file. @throws DomainError 422 naming row and column.
 */
export function parseSweepBytes(bytes: Uint8Array, temperatureC: number | undefined): ParsedSweep {
	let text: string;
	try {
		text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		throw new DomainError(422, 'The file is not UTF-8 text (is it a spreadsheet or a binary export?). Save the sweep as CSV. Nothing was stored.', [
			{ message: 'the bytes are not valid UTF-8 text' }
		]);
	}
	let sweep: ParsedSweep;
	try {
		sweep = parseSweepCsv(text, { temperatureC });
	} catch (e) {
		domainFromEngine(e);
	}
	if (sweep.runs.length > 1) {
		const temps = sweep.runs.map((r) => `${r.temperatureC.toFixed(1)} °C`).join(', ');
		throw new DomainError(422, `The file holds sweeps at ${temps}; upload one temperature per file. Nothing was stored.`, [
			{ column: sweep.columns.temperature, message: `several temperatures in one file (${temps})` }
		]);
	}
	return sweep;
}

/**
 * Checks, parses and fits a sweep without touching the database.
 * @throws DomainError 413 (too large) or 422 (unreadable, implausible or unfittable), with row/column issues.
 */
export function prepare(
	source: SweepSource,
	opts: { temperatureC?: number; excludedV?: [number, number] | null; temperatureDefaulted?: boolean },
	ctx: FitContext
): PreparedRun {
	let bytes: Buffer;
	let fileName: string;
	if (source.kind === 'points') {
		bytes = Buffer.from(pointsToCsv(source.points), 'utf8');
		fileName = source.fileName ?? 'points.csv';
	} else {
		bytes = Buffer.from(source.bytes.buffer, source.bytes.byteOffset, source.bytes.byteLength);
		fileName = source.fileName.trim() || 'sweep.csv';
	}
	try {
		checkSweepSize(bytes.byteLength, UPLOAD_LIMIT_BYTES);
	} catch (e) {
		domainFromEngine(e);
	}
	const sweep = parseSweepBytes(bytes, opts.temperatureC);
	const run = sweep.runs[0];
	if (sweep.columns.temperature && opts.temperatureC !== undefined && !opts.temperatureDefaulted && Math.abs(run.temperatureC - opts.temperatureC) > TEMPERATURE_AGREEMENT_K) {
		throw new DomainError(
			422,
			`The file says ${run.temperatureC.toFixed(1)} °C but ${opts.temperatureC} °C was entered; correct one of them. Nothing was stored.`,
			[{ column: sweep.columns.temperature, message: `file temperature ${run.temperatureC.toFixed(1)} °C disagrees with the entered ${opts.temperatureC} °C` }]
		);
	}
	const excludedV = opts.excludedV ?? null;
	const { fit } = fitParsed(sweep, ctx, excludedV);
	let neg = false;
	let pos = false;
	const points: [number, number][] = [];
	for (let k = 0; k < run.voltageV.length; k++) {
		points.push([run.voltageV[k], run.currentA[k]]);
		if (run.voltageV[k] < 0) neg = true;
		if (run.voltageV[k] > 0) pos = true;
	}
	return {
		fileName,
		bytes,
		sha256: sha256(bytes),
		temperatureC: Math.round(run.temperatureC * 100) / 100,
		direction: neg && pos ? 'both' : neg ? 'reverse' : 'forward',
		points,
		columns: sweep.columns,
		fit,
		warnings: sweep.warnings
	};
}

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

export type IngestInput = {
	partId: number;
	sample: string;
	source: SweepSource;
	temperatureC?: number;
	excludedV?: [number, number] | null;
	/** Parse and fit only: nothing is written (the upload page's preview fit). */
	dryRun?: boolean;
};

export type IngestResult = {
	id: number | null;
	partId: number;
	sample: string;
	fileName: string;
	sha256: string;
	temperatureC: number;
	direction: SweepDirection;
	pointCount: number;
	points: [number, number][];
	columns: ParsedSweep['columns'];
	fit: StoredFit;
	warnings: Issue[];
	modelVersion: number | null;
	stored: boolean;
};

/**
 * Ingests one run for a part: the same path for uploads, API calls and the demo seed.
 * A refused run writes nothing. @throws DomainError 404/409/413/422.
 */
export async function ingest(actor: { id: string } | null, input: IngestInput): Promise<IngestResult> {
	const [part] = await db.select().from(parts).where(eq(parts.id, input.partId));
	if (!part) throw new DomainError(404, `No part ${input.partId}.`);
	const unit = input.sample.trim();
	if (!/^[\w.#/-]{1,40}$/.test(unit)) throw new DomainError(400, 'The sample label is letters, digits and . # / - (1–40 characters).', [{ path: 'sample', message: 'invalid sample label' }]);
	const prepared = prepare(input.source, { temperatureC: input.temperatureC, excludedV: input.excludedV }, { material: part.material as Material, given: part.givenModel });
	const dup = await duplicateOf(prepared.sha256);
	if (dup) throw duplicateError(dup);
	const base = {
		partId: part.id,
		sample: unit,
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
	try {
		return await db.transaction(async (tx) => {
			let [sample] = await tx.select().from(samples).where(and(eq(samples.partId, part.id), eq(samples.unit, unit)));
			if (!sample) {
				// Two files of one new sample arrive together in a campaign: the first creates it,
				// the other waits for that and uses it.
				[sample] = await tx.insert(samples).values({ partId: part.id, unit }).onConflictDoNothing({ target: [samples.partId, samples.unit] }).returning();
				if (sample) await recordAudit(tx, { actorId: actor?.id ?? null, action: 'sample.create', entity: 'sample', entityId: sample.id, detail: { partId: part.id, unit } });
				else [sample] = await tx.select().from(samples).where(and(eq(samples.partId, part.id), eq(samples.unit, unit)));
			}
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
					uploadedBy: actor?.id ?? null
				})
				.returning({ id: runs.id });
			await tx.insert(fits).values({ runId: run.id, partId: part.id, sampleId: sample.id, ...prepared.fit, fittedBy: actor?.id ?? null });
			const modelVersion = await rebuildPartModel(tx, part.id);
			await recordAudit(tx, {
				actorId: actor?.id ?? null,
				action: 'run.ingest',
				entity: 'run',
				entityId: run.id,
				detail: { partId: part.id, sample: unit, fileName: prepared.fileName, sha256: prepared.sha256, temperatureC: prepared.temperatureC, excludedV: prepared.fit.excludedV }
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
