// One file on the upload page: its preview (parsed in the browser with the engine's CSV
// reader), its upload and fit state, and the server's answer.
import { parseSweepCsv, SweepError, type ParsedSweep } from '$lib/junction';
import type { DataIssue } from '$lib/junction';

export type FitAnswer = {
	id: number | null;
	sample: string;
	fileName: string;
	temperatureC: number;
	direction: string;
	points: [number, number][];
	fit: {
		model: Record<string, number>;
		interval: Record<string, [number, number]>;
		quality: { points: number; rejected: number; rmsResidualV: number };
		range: { currentA: [number, number]; voltageV: [number, number] };
		excludedV: [number, number] | null;
	};
	warnings: DataIssue[];
	stored: boolean;
};

export type Phase = 'ready' | 'uploading' | 'fitting' | 'fitted' | 'storing' | 'stored' | 'refused' | 'failed' | 'unreadable';

export class Intake {
	file: File;
	text = $state('');
	sample = $state('');
	temperature = $state('');
	phase = $state<Phase>('ready');
	/** Upload progress 0…1 (bytes sent / total, from XMLHttpRequest). */
	progress = $state(0);
	answer = $state<FitAnswer | null>(null);
	error = $state<{ status: number; message: string; issues?: DataIssue[] } | null>(null);
	excludeFrom = $state('');
	excludeTo = $state('');

	constructor(file: File, sample: string) {
		this.file = file;
		this.sample = sample;
	}

	/** First lines as they are in the file. */
	get head(): string[] {
		return this.text.split(/\r\n|\r|\n/).slice(0, 6);
	}

	/** The engine's reading of the file (or its complaint), with the entered temperature if any. */
	get preview(): { sweep: ParsedSweep | null; issues: DataIssue[]; needsTemperature: boolean } {
		if (!this.text) return { sweep: null, issues: [], needsTemperature: false };
		const t = this.temperature.trim() === '' ? undefined : Number(this.temperature);
		try {
			return { sweep: parseSweepCsv(this.text, { temperatureC: Number.isFinite(t) ? t : undefined }), issues: [], needsTemperature: false };
		} catch (e) {
			if (e instanceof SweepError) {
				const needs = e.issues.some((i) => /temperature/.test(i.message) && i.row === undefined);
				return { sweep: null, issues: e.issues, needsTemperature: needs };
			}
			return { sweep: null, issues: [{ message: (e as Error).message }], needsTemperature: false };
		}
	}
}

/** Posts a file with real upload progress; resolves with status and parsed JSON. */
export function send(url: string, form: FormData, onProgress: (fraction: number) => void, onSent: () => void): Promise<{ status: number; body: unknown }> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('POST', url);
		xhr.responseType = 'text';
		xhr.upload.onprogress = (e) => {
			if (e.lengthComputable) onProgress(e.loaded / e.total);
		};
		xhr.upload.onload = () => {
			onProgress(1);
			onSent();
		};
		xhr.onload = () => {
			let body: unknown = null;
			try {
				body = JSON.parse(xhr.responseText);
			} catch {
				body = { error: { message: xhr.responseText.slice(0, 200) || `HTTP ${xhr.status}` } };
			}
			resolve({ status: xhr.status, body });
		};
		xhr.onerror = () => reject(new Error('The connection failed during the upload.'));
		xhr.send(form);
	});
}
