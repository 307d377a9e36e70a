// Reading a sweep upload from a request in any of the three accepted forms.
import type { RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { pointsInput, temperatureC as temperatureSchema, excludeRange } from '$lib/schemas/catalogue';
import { DomainError, zodIssues } from './api';
import { UPLOAD_LIMIT_BYTES, type SweepSource } from './runs';

export type UploadRequest = { sample: string; temperatureC?: number; source: SweepSource; excludedV: [number, number] | null };

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
			excludedV: parseExclusion(form.get('excludeFromV'), form.get('excludeToV'))
		};
	}
	if (type.startsWith('application/json')) {
		const raw = new TextDecoder().decode(await bodyBytes(event));
		let body: unknown;
		try {
			body = JSON.parse(raw);
		} catch {
			throw new DomainError(400, 'The body is not valid JSON.');
		}
		const r = pointsInput.extend({ excludeFromV: z.number().optional(), excludeToV: z.number().optional() }).safeParse(body);
		if (!r.success) throw new DomainError(400, 'The request does not match { sample, temperatureC, points: [{ voltageV, currentA }] }.', zodIssues(r.error));
		return {
			sample: r.data.sample,
			temperatureC: r.data.temperatureC,
			source: { kind: 'points', fileName: r.data.fileName, points: r.data.points },
			excludedV: parseExclusion(r.data.excludeFromV, r.data.excludeToV)
		};
	}
	if (type.startsWith('text/csv') || type.startsWith('text/plain') || type === '' || type.startsWith('application/octet-stream')) {
		const bytes = await bodyBytes(event);
		return {
			sample: sampleFrom(q.get('sample')),
			temperatureC: parseTemperature(q.get('temperatureC')),
			source: { kind: 'file', fileName: q.get('fileName') || 'sweep.csv', bytes },
			excludedV: parseExclusion(q.get('excludeFromV'), q.get('excludeToV'))
		};
	}
	throw new DomainError(400, `Send multipart/form-data, application/json or text/csv, not ${type}.`);
}

export { bodyBytes, parseTemperature };
