// Reading and fitting a sweep before anything is written: the bytes checked, told apart as
// an I–V or a C–V sweep (said by the sender, or found from the header), parsed and fitted by
// the engine, the settings the file states compared with those entered. The same reading
// serves uploads, the stateless fit endpoints and later re-fits of a stored file.
import { createHash } from 'node:crypto';
import {
	FitError,
	SweepError,
	SweepTooLargeError,
	checkSweepSize,
	fitCapacitance,
	fitSweep,
	parseCapacitanceCsv,
	parseSweepCsv,
	sweepKindOf,
	type CapacitanceFitResult,
	type FitResult,
	type ParsedCapacitanceSweep,
	type ParsedSweep
} from '$lib/junction';
import { egFor, engineMaterial, toStored } from '$lib/catalogue/models';
import type { Measurement, StoredCvFit } from '$lib/catalogue/capacitance';
import type { Material } from '$lib/catalogue/vocabulary';
import { DomainError, type Issue } from './errors';
import type { FitInterval, FitRange, StoredModel, SweepDirection } from './db/schema';

/** Largest sweep upload accepted [bytes]: bench files are a few kilobytes to a few hundred. */
export const UPLOAD_LIMIT_BYTES = 2 * 1024 * 1024;
/** A file temperature column and a typed temperature may differ by this much [K]. */
const TEMPERATURE_AGREEMENT_K = 1.5;

type IvPoint = { voltageV: number; currentA: number };
type CvPoint = { voltageV: number; capacitanceF: number };

export type SweepSource =
	| { kind: 'file'; fileName: string; bytes: Uint8Array }
	| { kind: 'points'; fileName?: string; points: IvPoint[] }
	| { kind: 'cv-points'; fileName?: string; points: CvPoint[] };

export type StoredFit = {
	model: StoredModel;
	interval: FitInterval;
	quality: { points: number; rejected: number; rmsResidualV: number };
	range: FitRange;
	excludedV: [number, number] | null;
};
export type { StoredCvFit };

/** What a sweep is read and fitted with besides its bytes. */
export type RunSettings = {
	temperatureC?: number;
	/** The temperature is the endpoint's default, not typed: a file column wins without complaint. */
	temperatureDefaulted?: boolean;
	excludedV?: [number, number] | null;
	/** Said by the sender; otherwise found from the file's header (I–V when it cannot tell). */
	measurement?: Measurement;
	frequencyHz?: number;
	testLevelV?: number;
	strayCapacitanceF?: number;
};

type PreparedCommon = {
	fileName: string;
	bytes: Buffer;
	sha256: string;
	temperatureC: number;
	direction: SweepDirection;
	/** Merged points as [voltageV, currentA] (C–V: [voltageV, capacitanceF]). */
	points: [number, number][];
	warnings: Issue[];
};
export type PreparedIv = PreparedCommon & { measurement: 'iv'; columns: ParsedSweep['columns']; fit: StoredFit };
export type PreparedCv = PreparedCommon & {
	measurement: 'cv';
	columns: ParsedCapacitanceSweep['columns'];
	fit: StoredCvFit;
	frequencyHz: number | null;
	testLevelV: number | null;
};
export type PreparedRun = PreparedIv | PreparedCv;

export type FitContext = { material: Material; given?: StoredModel | null };

function sha256(bytes: Uint8Array): string {
	return createHash('sha256').update(bytes).digest('hex');
}

/** Points (from JSON) written as a CSV file, so they take the same path and are stored as a file. */
export function pointsToCsv(source: Extract<SweepSource, { kind: 'points' | 'cv-points' }>): string {
	if (source.kind === 'cv-points') return 'V (V),C (F)\n' + source.points.map((p) => `${p.voltageV},${p.capacitanceF}`).join('\n') + '\n';
	return 'V (V),I (A)\n' + source.points.map((p) => `${p.voltageV},${p.currentA}`).join('\n') + '\n';
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

/** The engine's fit of a parsed single-temperature I–V sweep, in the stored shape. */
export function fitParsed(sweep: ParsedSweep, ctx: FitContext, excludedV: [number, number] | null = null): { fit: StoredFit; result: FitResult } {
	let result: FitResult;
	try {
		result = fitSweep(sweep, { ...(excludedV ? { excludeV: excludedV } : {}), material: engineMaterial(ctx.material), EG: egFor(ctx.material, ctx.given) });
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

/** The engine's fit of a parsed C–V sweep (one temperature), in the stored shape. */
export function fitCapacitanceParsed(sweep: ParsedCapacitanceSweep, opts: { excludedV?: [number, number] | null; strayCapacitanceF?: number }): { fit: StoredCvFit; result: CapacitanceFitResult } {
	const run = sweep.runs[0];
	let result: CapacitanceFitResult;
	try {
		result = fitCapacitance(run, { ...(opts.excludedV ? { excludeV: opts.excludedV } : {}), strayCapacitanceF: opts.strayCapacitanceF ?? 0 }, sweep.rejected);
	} catch (e) {
		domainFromEngine(e);
	}
	const t = Math.round(run.temperatureC * 100) / 100;
	return {
		result,
		fit: {
			model: { ...result.model, TNOM: t },
			interval: result.interval,
			quality: { ...result.quality, correlation: result.correlation },
			range: { voltageV: result.range.voltageV, capacitanceF: result.range.capacitanceF, fittedV: result.range.fittedV, temperatureC: t },
			excludedV: opts.excludedV ?? null,
			strayCapacitanceF: result.strayCapacitanceF
		}
	};
}

function textOf(bytes: Uint8Array): string {
	try {
		return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		throw new DomainError(422, 'The file is not UTF-8 text (is it a spreadsheet or a binary export?). Save the sweep as CSV. Nothing was stored.', [
			{ message: 'the bytes are not valid UTF-8 text' }
		]);
	}
}

/** A file of several temperatures is refused: one run is one temperature. */
function oneTemperature(temps: number[], column: string | undefined) {
	if (temps.length <= 1) return;
	const list = temps.map((t) => `${t.toFixed(1)} °C`).join(', ');
	throw new DomainError(422, `The file holds sweeps at ${list}; upload one temperature per file. Nothing was stored.`, [{ column, message: `several temperatures in one file (${list})` }]);
}

/** Says which way to send a file whose header names the other kind of sweep. */
function otherKindHint(text: string, wanted: Measurement): string {
	const found = sweepKindOf(text);
	if (!found || found === wanted) return '';
	return found === 'cv'
		? ' The header names a capacitance column: send the file as a C–V sweep (measurement "cv").'
		: ' The header names a current column: send the file as an I–V sweep (measurement "iv").';
}

function parseWith<T>(text: string, wanted: Measurement, parse: () => T): T {
	try {
		return parse();
	} catch (e) {
		const hint = otherKindHint(text, wanted);
		if (hint && e instanceof SweepError) throw new DomainError(422, `The sweep cannot be read: ${e.message.replace(/^sweep rejected: /, '')}.${hint} Nothing was stored.`, e.issues);
		domainFromEngine(e);
	}
}

/**
 * Reads I–V sweep bytes (UTF-8 CSV) holding one temperature, at the typed temperature when the
 * file has no temperature column. @throws DomainError 422 naming row and column.
 */
export function parseSweepBytes(bytes: Uint8Array, temperatureC: number | undefined): ParsedSweep {
	const text = textOf(bytes);
	const sweep = parseWith(text, 'iv', () => parseSweepCsv(text, { temperatureC }));
	oneTemperature(sweep.runs.map((r) => r.temperatureC), sweep.columns.temperature);
	return sweep;
}

/** Reads C–V sweep bytes holding one temperature, as `parseSweepBytes` does I–V ones. */
export function parseCapacitanceBytes(bytes: Uint8Array, temperatureC: number | undefined): ParsedCapacitanceSweep {
	const text = textOf(bytes);
	const sweep = parseWith(text, 'cv', () => parseCapacitanceCsv(text, { temperatureC }));
	oneTemperature(sweep.runs.map((r) => r.temperatureC), sweep.columns.temperature);
	return sweep;
}

/** A value the file states and a value typed must agree; the file's wins when nothing was typed. */
function agree(what: string, column: string | undefined, fromFile: number | undefined, typed: number | undefined, same: (a: number, b: number) => boolean, show: (x: number) => string): number | null {
	if (fromFile !== undefined && typed !== undefined && !same(fromFile, typed))
		throw new DomainError(422, `The file says ${show(fromFile)} but ${show(typed)} was entered for the ${what}; correct one of them. Nothing was stored.`, [
			{ column, message: `file ${what} ${show(fromFile)} disagrees with the entered ${show(typed)}` }
		]);
	return fromFile ?? typed ?? null;
}

function directionOf(points: [number, number][]): SweepDirection {
	const neg = points.some(([v]) => v < 0);
	const pos = points.some(([v]) => v > 0);
	return neg && pos ? 'both' : neg ? 'reverse' : 'forward';
}

/** The sweep's bytes and file name, and which measurement it is. */
function sourceBytes(source: SweepSource, settings: RunSettings): { bytes: Buffer; fileName: string; measurement: Measurement } {
	if (source.kind === 'file') {
		const bytes = Buffer.from(source.bytes.buffer, source.bytes.byteOffset, source.bytes.byteLength);
		let measurement = settings.measurement;
		if (!measurement) {
			let text = '';
			try {
				text = new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, 64 * 1024));
			} catch {
				/* not text: the I–V reading below says so */
			}
			measurement = sweepKindOf(text) ?? 'iv';
		}
		return { bytes, fileName: source.fileName.trim() || 'sweep.csv', measurement };
	}
	const measurement: Measurement = source.kind === 'cv-points' ? 'cv' : 'iv';
	if (settings.measurement && settings.measurement !== measurement)
		throw new DomainError(400, `The points are ${measurement === 'cv' ? '{ voltageV, capacitanceF }' : '{ voltageV, currentA }'} but measurement "${settings.measurement}" was given.`, [
			{ path: 'measurement', message: 'does not match the points' }
		]);
	return { bytes: Buffer.from(pointsToCsv(source), 'utf8'), fileName: source.fileName ?? 'points.csv', measurement };
}

function checkTemperature(fileColumn: string | undefined, fileC: number, settings: RunSettings) {
	if (fileColumn && !settings.temperatureDefaulted)
		agree('temperature', fileColumn, fileC, settings.temperatureC, (a, b) => Math.abs(a - b) <= TEMPERATURE_AGREEMENT_K, (t) => `${Math.round(t * 10) / 10} °C`);
}

function prepareIv(common: Omit<PreparedCommon, 'temperatureC' | 'direction' | 'points' | 'warnings'>, settings: RunSettings, ctx: FitContext): PreparedIv {
	if (settings.strayCapacitanceF !== undefined || settings.frequencyHz !== undefined || settings.testLevelV !== undefined)
		throw new DomainError(400, 'A test frequency, test level or stray capacitance belongs to a C–V sweep; this is an I–V sweep.', [{ path: 'measurement', message: 'C–V settings sent with an I–V sweep' }]);
	const sweep = parseSweepBytes(common.bytes, settings.temperatureC);
	const run = sweep.runs[0];
	checkTemperature(sweep.columns.temperature, run.temperatureC, settings);
	const { fit } = fitParsed(sweep, ctx, settings.excludedV ?? null);
	const points = Array.from(run.voltageV, (v, k): [number, number] => [v, run.currentA[k]]);
	return { ...common, measurement: 'iv', temperatureC: Math.round(run.temperatureC * 100) / 100, direction: directionOf(points), points, columns: sweep.columns, fit, warnings: sweep.warnings };
}

function prepareCv(common: Omit<PreparedCommon, 'temperatureC' | 'direction' | 'points' | 'warnings'>, settings: RunSettings): PreparedCv {
	const sweep = parseCapacitanceBytes(common.bytes, settings.temperatureC);
	const run = sweep.runs[0];
	checkTemperature(sweep.columns.temperature, run.temperatureC, settings);
	const rel = (a: number, b: number) => Math.abs(a - b) <= 1e-6 * Math.max(a, b);
	const frequencyHz = agree('test frequency', sweep.columns.frequency, sweep.frequencyHz, settings.frequencyHz, rel, (f) => `${f} Hz`);
	const testLevelV = agree('test-signal level', sweep.columns.level, sweep.testLevelV, settings.testLevelV, rel, (v) => `${v} V`);
	const { fit, result } = fitCapacitanceParsed(sweep, { excludedV: settings.excludedV, strayCapacitanceF: settings.strayCapacitanceF });
	const points = Array.from(run.voltageV, (v, k): [number, number] => [v, run.capacitanceF[k]]);
	return {
		...common,
		measurement: 'cv',
		temperatureC: Math.round(run.temperatureC * 100) / 100,
		direction: directionOf(points),
		points,
		columns: sweep.columns,
		fit,
		frequencyHz,
		testLevelV,
		warnings: [...sweep.warnings, ...result.warnings]
	};
}

/**
 * Checks, parses and fits a sweep without touching the database.
 * @throws DomainError 400 (settings that do not fit the sweep), 413 (too large) or 422
 * (unreadable, implausible or unfittable), with row/column issues.
 */
export function prepare(source: SweepSource, settings: RunSettings, ctx: FitContext): PreparedRun {
	const { bytes, fileName, measurement } = sourceBytes(source, settings);
	try {
		checkSweepSize(bytes.byteLength, UPLOAD_LIMIT_BYTES);
	} catch (e) {
		domainFromEngine(e);
	}
	const common = { fileName, bytes, sha256: sha256(bytes) };
	return measurement === 'cv' ? prepareCv(common, settings) : prepareIv(common, settings, ctx);
}
