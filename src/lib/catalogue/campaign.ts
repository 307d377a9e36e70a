// A measurement campaign's folder of sweep files: each file mapped to part, sample and
// temperature by the name pattern, then uploaded on its own through the runs API (one
// file's refusal leaves the others), a few at a time so neither page nor server stalls.
// Runs in the browser and in Node (the tests and the bench drive it the same way).
import Papa from 'papaparse';
import { compilePattern, matchPart, readName, type Direction } from './file-pattern';

export type CampaignPart = { id: number; pn: string; mk: string };
export type CampaignFile = { path: string; bytes: () => Promise<Uint8Array> };

export type PlannedFile = {
	path: string;
	/** Null when the name does not map to a part, sample and temperature; `reason` says why. */
	target: { partId: number; partNumber: string; maker: string; sample: string; temperatureC: number; direction: Direction | null } | null;
	reason: string | null;
};

export type FileState = 'waiting' | 'reading' | 'uploading' | 'stored' | 'duplicate' | 'refused' | 'skipped' | 'failed';
export type FileOutcome = { state: FileState; message: string; runId: number | null; sha256: string | null };

/** Maps every file name to its part with the pattern; nothing is read or sent yet. */
export function planCampaign(paths: string[], pattern: string, parts: CampaignPart[]): PlannedFile[] {
	const compiled = compilePattern(pattern);
	return paths.map((path) => {
		const name = readName(path, compiled);
		if (!name.ok) return { path, target: null, reason: name.reason };
		const hit = matchPart(name.fields.part, parts);
		if (!hit.ok) return { path, target: null, reason: hit.reason };
		const { sample, temperatureC, direction } = name.fields;
		if (!/^[\w.#/-]{1,40}$/.test(sample)) return { path, target: null, reason: `the sample “${sample}” is not a label (letters, digits and . # / -)` };
		return { path, target: { partId: hit.part.id, partNumber: hit.part.pn, maker: hit.part.mk, sample, temperatureC, direction }, reason: null };
	});
}

/** One upload's answer: the HTTP status and the JSON body. */
export type Uploader = (target: NonNullable<PlannedFile['target']>, fileName: string, bytes: Uint8Array) => Promise<{ status: number; body: unknown }>;

/** Uploads as multipart (file, sample, temperatureC) to POST /api/v1/junctions/{id}/runs. */
export function runsUploader(baseUrl = '', headers: Record<string, string> = {}): Uploader {
	return async (target, fileName, bytes) => {
		const form = new FormData();
		form.set('file', new Blob([bytes as BlobPart], { type: 'text/csv' }), fileName);
		form.set('sample', target.sample);
		form.set('temperatureC', String(target.temperatureC));
		const res = await fetch(`${baseUrl}/api/v1/junctions/${target.partId}/runs`, { method: 'POST', body: form, headers });
		const text = await res.text();
		let body: unknown = text;
		try {
			body = JSON.parse(text);
		} catch {
			/* not JSON: keep the text */
		}
		return { status: res.status, body };
	};
}

async function sha256Hex(bytes: Uint8Array): Promise<string> {
	const digest = await crypto.subtle.digest('SHA-256', bytes as BufferSource);
	return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

type Answer = { id?: number; direction?: Direction; error?: { message?: string } };

function outcomeOf(status: number, body: unknown, sha: string, planned: PlannedFile): FileOutcome {
	const b = (body ?? {}) as Answer;
	if (status === 201) {
		const said = planned.target?.direction;
		const note = said && b.direction && said !== b.direction && b.direction !== 'both' ? ` (the name says ${said}, the points are ${b.direction})` : '';
		return { state: 'stored', message: `stored as run ${b.id}${note}`, runId: b.id ?? null, sha256: sha };
	}
	const message = b.error?.message ?? (typeof body === 'string' && body ? body.slice(0, 200) : `HTTP ${status}`);
	if (status === 409 && /already uploaded/.test(message)) return { state: 'duplicate', message, runId: null, sha256: sha };
	if (status >= 400 && status < 500) return { state: 'refused', message, runId: null, sha256: sha };
	return { state: 'failed', message, runId: null, sha256: sha };
}

/**
 * Uploads every mapped file, `concurrency` at a time, reporting each state change. Files the
 * pattern could not map are skipped with their reason; a second copy of a file in the same
 * folder (same SHA-256) is a duplicate without being sent.
 */
export async function runCampaign(
	planned: PlannedFile[],
	files: Map<string, CampaignFile>,
	upload: Uploader,
	opts: { concurrency?: number; onChange?: (index: number, outcome: FileOutcome) => void } = {}
): Promise<FileOutcome[]> {
	const outcomes: FileOutcome[] = planned.map(() => ({ state: 'waiting', message: '', runId: null, sha256: null }));
	const set = (k: number, o: FileOutcome) => {
		outcomes[k] = o;
		opts.onChange?.(k, o);
	};
	const seen = new Map<string, string>();
	let next = 0;
	async function worker() {
		while (next < planned.length) {
			const k = next++;
			const p = planned[k];
			if (!p.target) {
				set(k, { state: 'skipped', message: p.reason ?? 'not mapped', runId: null, sha256: null });
				continue;
			}
			try {
				set(k, { ...outcomes[k], state: 'reading' });
				const bytes = await files.get(p.path)!.bytes();
				const sha = await sha256Hex(bytes);
				const first = seen.get(sha);
				if (first) {
					set(k, { state: 'duplicate', message: `the same file as ${first} in this folder`, runId: null, sha256: sha });
					continue;
				}
				seen.set(sha, p.path);
				set(k, { ...outcomes[k], state: 'uploading', sha256: sha });
				const r = await upload(p.target, p.path.split(/[\\/]/).pop() ?? p.path, bytes);
				set(k, outcomeOf(r.status, r.body, sha, p));
			} catch (e) {
				set(k, { state: 'failed', message: (e as Error).message || 'the upload did not complete', runId: null, sha256: outcomes[k].sha256 });
			}
		}
	}
	await Promise.all(Array.from({ length: Math.max(1, opts.concurrency ?? 3) }, worker));
	return outcomes;
}

/** Counts of each final state, for the summary line. */
export function tally(outcomes: FileOutcome[]): Record<FileState, number> {
	const t = { waiting: 0, reading: 0, uploading: 0, stored: 0, duplicate: 0, refused: 0, skipped: 0, failed: 0 };
	for (const o of outcomes) t[o.state]++;
	return t;
}

/** The campaign's summary as CSV: one line per file, what happened and why. */
export function summaryCsv(planned: PlannedFile[], outcomes: FileOutcome[]): string {
	const rows = planned.map((p, k) => [
		p.path,
		p.target ? p.target.maker : '',
		p.target ? p.target.partNumber : '',
		p.target ? p.target.sample : '',
		p.target ? p.target.temperatureC : '',
		p.target?.direction ?? '',
		outcomes[k].state,
		outcomes[k].runId ?? '',
		outcomes[k].sha256 ?? '',
		outcomes[k].message
	]);
	return Papa.unparse([['File', 'Maker', 'Part number', 'Sample', 'Temperature (°C)', 'Direction in name', 'Result', 'Run', 'SHA-256', 'Reason or note'], ...rows], { newline: '\r\n', escapeFormulae: true }) + '\r\n';
}
