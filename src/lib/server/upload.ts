// Reading a sweep from a request in any of the accepted forms: an upload for a part
// (multipart, JSON points, a CSV body) and the stateless fits (JSON points or a CSV body).
import type { RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { fitInput, pointsInput, temperatureC as temperatureSchema, excludeRange } from '$lib/schemas/catalogue';
import { capacitanceFitInput, cvPointsUpload, cvSettings, isCvBody, measurement as measurementSchema, type CvSettings } from '$lib/schemas/capacitance';
import type { Measurement } from '$lib/catalogue/capacitance';
import { zodIssues } from './api';
import { DomainError } from './errors';
import { UPLOAD_LIMIT_BYTES, type SweepSource } from './run-intake';

export type UploadRequest = CvSettings & {
	sample: string;
	temperatureC?: number;
	source: SweepSource;
	excludedV: [number, number] | null;
	/** Said by the sender; absent: found from the file's header. */
	measurement?: Measurement;
};

function tooLarge(size: number | string): never {
	throw new DomainError(413, `The upload is ${size} bytes; sweeps up to ${UPLOAD_LIMIT_BYTES} bytes are accepted. Nothing was stored.`);
}

/**
 * Refuses an over-long body from its Content-Length without keeping it. The body is read
 * and thrown away (up to 64 MB) so the client sees the 413 rather than a reset connection.
 */
export async function checkLength(event: RequestEvent, limit = UPLOAD_LIMIT_BYTES + 64 * 1024) {
	const len = Number(event.request.headers.get('content-length') ?? NaN);
	if (Number.isFinite(len) && len > limit) {
		if (len <= 64 * 1024 * 1024 && event.request.body) {
			const reader = event.request.body.getReader();
			try {
				while (!(await reader.read()).done) {
					/* discard */
				}
			} catch {
				/* the client gave up: nothing to answer */
			}
		}
		tooLarge(len);
	}
}

async function bodyBytes(event: RequestEvent): Promise<Uint8Array> {
	try {
		const buf = new Uint8Array(await event.request.arrayBuffer());
		if (buf.byteLength > UPLOAD_LIMIT_BYTES) tooLarge(buf.byteLength);
		return buf;
	} catch (e) {
		if (e instanceof DomainError) throw e;
		if ((e as { status?: number }).status === 413) tooLarge('more than the limit of');
		throw new DomainError(400, 'The request body could not be read.');
	}
}

/** The temperature given beside a file (°C, or with units); absent when the file must say it. */
function parseTemperature(raw: string | null | undefined): number | undefined {
	if (raw === null || raw === undefined || String(raw).trim() === '') return undefined;
	const r = temperatureSchema.safeParse(String(raw).trim());
	if (!r.success) throw new DomainError(400, r.error.issues[0].message, [{ path: 'temperatureC', message: r.error.issues[0].message }]);
	return r.data;
}

function parseExclusion(from: unknown, to: unknown): [number, number] | null {
	if ((from === null || from === undefined || from === '') && (to === null || to === undefined || to === '')) return null;
	const r = excludeRange.safeParse({ fromV: from, toV: to });
	if (!r.success) throw new DomainError(400, 'The window left out of the fit is not valid.', zodIssues(r.error));
	return [r.data.fromV, r.data.toV];
}

const sampleLabel = pointsInput.shape.sample;

/** The measurement kind and C–V settings from form fields or query parameters (strings, SI prefixes allowed). */
function settingsFrom(get: (name: string) => string | null): { measurement?: Measurement } & CvSettings {
	const text = (name: string) => {
		const v = get(name);
		return v === null || v.trim() === '' ? undefined : v.trim();
	};
	const m = text('measurement');
	const kind = m === undefined ? undefined : measurementSchema.safeParse(m);
	if (kind && !kind.success) throw new DomainError(400, kind.error.issues[0].message, [{ path: 'measurement', message: kind.error.issues[0].message }]);
	const r = cvSettings.safeParse({ frequencyHz: text('frequencyHz'), testLevelV: text('testLevelV'), strayCapacitanceF: text('strayCapacitanceF') });
	if (!r.success) throw new DomainError(400, r.error.issues[0].message, zodIssues(r.error));
	return { ...(kind?.success ? { measurement: kind.data } : {}), ...dropUndefined(r.data) };
}

function dropUndefined<T extends object>(o: T): T {
	return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

async function jsonBody(event: RequestEvent): Promise<unknown> {
	const raw = new TextDecoder().decode(await bodyBytes(event));
	try {
		return JSON.parse(raw);
	} catch {
		throw new DomainError(400, 'The body is not valid JSON.');
	}
}

/** A JSON run upload: I–V points { voltageV, currentA } or C–V points { voltageV, capacitanceF }. */
function jsonUpload(body: unknown): UploadRequest {
	if (isCvBody(body)) {
		const r = cvPointsUpload.safeParse(body);
		if (!r.success) throw new DomainError(400, 'The request does not match { sample, temperatureC, measurement: "cv", points: [{ voltageV, capacitanceF }] }.', zodIssues(r.error));
		const { sample, temperatureC, fileName, points, excludeFromV, excludeToV, frequencyHz, testLevelV, strayCapacitanceF } = r.data;
		return {
			sample,
			temperatureC,
			measurement: 'cv',
			source: { kind: 'cv-points', fileName, points },
			excludedV: parseExclusion(excludeFromV, excludeToV),
			...dropUndefined({ frequencyHz, testLevelV, strayCapacitanceF })
		};
	}
	const r = pointsInput
		.extend({ measurement: z.literal('iv').optional(), excludeFromV: z.number().optional(), excludeToV: z.number().optional() })
		.safeParse(body);
	if (!r.success) throw new DomainError(400, 'The request does not match { sample, temperatureC, points: [{ voltageV, currentA }] }.', zodIssues(r.error));
	return {
		sample: r.data.sample,
		temperatureC: r.data.temperatureC,
		source: { kind: 'points', fileName: r.data.fileName, points: r.data.points },
		excludedV: parseExclusion(r.data.excludeFromV, r.data.excludeToV)
	};
}

function sampleFrom(raw: unknown): string {
	const r = sampleLabel.safeParse(typeof raw === 'string' ? raw : '');
	if (!r.success) throw new DomainError(400, `sample: ${r.error.issues[0].message}`, [{ path: 'sample', message: r.error.issues[0].message }]);
	return r.data;
}

/** multipart (file, sample, temperatureC), JSON ({ sample, temperatureC, points }) or text/csv (query params). */
export async function readUpload(event: RequestEvent): Promise<UploadRequest> {
	await checkLength(event);
	const type = (event.request.headers.get('content-type') ?? '').toLowerCase();
	const q = event.url.searchParams;
	if (type.startsWith('multipart/form-data')) {
		let form: FormData;
		try {
			form = await event.request.formData();
		} catch (e) {
			if ((e as { status?: number }).status === 413) tooLarge('more than the limit of');
			throw new DomainError(400, 'The multipart form could not be read.');
		}
		const file = form.get('file');
		if (!(file instanceof File)) throw new DomainError(400, 'Attach the sweep as the form field "file".', [{ path: 'file', message: 'missing file' }]);
		if (file.size > UPLOAD_LIMIT_BYTES) tooLarge(file.size);
		const bytes = new Uint8Array(await file.arrayBuffer());
		return {
			sample: sampleFrom(form.get('sample')),
			temperatureC: parseTemperature(form.get('temperatureC') as string | null),
			source: { kind: 'file', fileName: file.name || 'sweep.csv', bytes },
			excludedV: parseExclusion(form.get('excludeFromV'), form.get('excludeToV')),
			...settingsFrom((k) => {
				const v = form.get(k);
				return typeof v === 'string' ? v : null;
			})
		};
	}
	if (type.startsWith('application/json')) return jsonUpload(await jsonBody(event));
	if (isCsvType(type)) {
		const bytes = await bodyBytes(event);
		return {
			sample: sampleFrom(q.get('sample')),
			temperatureC: parseTemperature(q.get('temperatureC')),
			source: { kind: 'file', fileName: q.get('fileName') || 'sweep.csv', bytes },
			excludedV: parseExclusion(q.get('excludeFromV'), q.get('excludeToV')),
			...settingsFrom((k) => q.get(k))
		};
	}
	throw new DomainError(400, `Send multipart/form-data, application/json or text/csv, not ${type}.`);
}

const isCsvType = (type: string) => type.startsWith('text/csv') || type.startsWith('text/plain') || type === '' || type.startsWith('application/octet-stream');

/** A stateless I–V fit: `{ temperatureC, points }`, or a CSV body with `?temperatureC=` (default 25). */
export async function readIvFit(event: RequestEvent): Promise<{ source: SweepSource; temperatureC: number; temperatureDefaulted: boolean }> {
	await checkLength(event);
	const type = (event.request.headers.get('content-type') ?? '').toLowerCase();
	if (type.startsWith('application/json')) {
		const r = fitInput.safeParse(await jsonBody(event));
		if (!r.success) throw new DomainError(400, 'The request does not match { temperatureC, points: [{ voltageV, currentA }] }.', zodIssues(r.error));
		return { source: { kind: 'points', points: r.data.points }, temperatureC: r.data.temperatureC, temperatureDefaulted: false };
	}
	if (!isCsvType(type)) throw new DomainError(400, `Send application/json or text/csv, not ${type}.`);
	const t = parseTemperature(event.url.searchParams.get('temperatureC'));
	return { source: { kind: 'file', fileName: 'sweep.csv', bytes: await bodyBytes(event) }, temperatureC: t ?? 25, temperatureDefaulted: t === undefined };
}

/**
 * A stateless C–V fit: `{ points: [{ voltageV, capacitanceF }], temperatureC?, strayCapacitanceF? }`,
 * or a CSV body with `?temperatureC=` (default 25) and `?strayCapacitanceF=`.
 */
export async function readCvFit(event: RequestEvent): Promise<{ source: SweepSource; temperatureC: number; temperatureDefaulted: boolean; strayCapacitanceF?: number }> {
	await checkLength(event);
	const type = (event.request.headers.get('content-type') ?? '').toLowerCase();
	if (type.startsWith('application/json')) {
		const r = capacitanceFitInput.safeParse(await jsonBody(event));
		if (!r.success) throw new DomainError(400, 'The request does not match { points: [{ voltageV, capacitanceF }] }.', zodIssues(r.error));
		return { source: { kind: 'cv-points', points: r.data.points }, temperatureC: r.data.temperatureC, temperatureDefaulted: false, ...dropUndefined({ strayCapacitanceF: r.data.strayCapacitanceF }) };
	}
	if (!isCsvType(type)) throw new DomainError(400, `Send application/json or text/csv, not ${type}.`);
	const q = event.url.searchParams;
	const t = parseTemperature(q.get('temperatureC'));
	const { strayCapacitanceF } = settingsFrom((k) => (k === 'strayCapacitanceF' ? q.get(k) : null));
	return {
		source: { kind: 'file', fileName: 'sweep.csv', bytes: await bodyBytes(event) },
		temperatureC: t ?? 25,
		temperatureDefaulted: t === undefined,
		...dropUndefined({ strayCapacitanceF })
	};
}

export { bodyBytes, parseTemperature };
