// One file on the upload page: its preview (parsed in the browser with the engine's CSV
// readers, I–V or C–V as the header says or the librarian chooses), its upload and fit
// state, and the server's answer.
import { parseCapacitanceCsv, parseSweepCsv, sweepKindOf, SweepError, type ParsedCapacitanceSweep, type ParsedSweep } from '$lib/junction';
import type { DataIssue } from '$lib/junction';
import type { Measurement, StoredCvFit } from '$lib/catalogue/capacitance';

type AnswerCommon = {
	id: number | null;
	sample: string;
	fileName: string;
	temperatureC: number;
	direction: string;
	points: [number, number][];
	warnings: DataIssue[];
	stored: boolean;
};
export type IvAnswer = AnswerCommon & {
	measurement: 'iv';
	fit: {
		model: Record<string, number>;
		interval: Record<string, [number, number]>;
		quality: { points: number; rejected: number; rmsResidualV: number };
		range: { currentA: [number, number]; voltageV: [number, number] };
		excludedV: [number, number] | null;
	};
};
export type CvAnswer = AnswerCommon & { measurement: 'cv'; fit: StoredCvFit; frequencyHz: number | null; testLevelV: number | null };
export type FitAnswer = IvAnswer | CvAnswer;

/** The browser's reading of a file: the engine's parse, or its complaint. */
export type Preview =
	| { measurement: 'iv'; sweep: ParsedSweep; issues: DataIssue[]; needsTemperature: false }
	| { measurement: 'cv'; sweep: ParsedCapacitanceSweep; issues: DataIssue[]; needsTemperature: false }
	| { measurement: Measurement; sweep: null; issues: DataIssue[]; needsTemperature: boolean };

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
	/** 'auto': as the header says (I–V when it cannot tell). */
	choice = $state<Measurement | 'auto'>('auto');
	frequency = $state('');
	level = $state('');
	stray = $state('');

	constructor(file: File, sample: string) {
		this.file = file;
		this.sample = sample;
	}

	/** First lines as they are in the file. */
	get head(): string[] {
		return this.text.split(/\r\n|\r|\n/).slice(0, 6);
	}

	/** What the header says the file is, or null when it cannot tell. */
	get detected(): Measurement | null {
		return this.text ? sweepKindOf(this.text) : null;
	}

	/** The measurement the file is read and sent as. */
	get measurement(): Measurement {
		return this.choice === 'auto' ? (this.detected ?? 'iv') : this.choice;
	}

	/** The engine's reading of the file (or its complaint), with the entered temperature if any. */
	get preview(): Preview {
		const measurement = this.measurement;
		if (!this.text) return { measurement, sweep: null, issues: [], needsTemperature: false };
		const t = this.temperature.trim() === '' ? undefined : Number(this.temperature);
		const opts = { temperatureC: Number.isFinite(t) ? t : undefined };
		try {
			if (measurement === 'cv') return { measurement, sweep: parseCapacitanceCsv(this.text, opts), issues: [], needsTemperature: false };
			return { measurement, sweep: parseSweepCsv(this.text, opts), issues: [], needsTemperature: false };
		} catch (e) {
			if (e instanceof SweepError) {
				const needs = e.issues.some((i) => /temperature/.test(i.message) && i.row === undefined);
				return { measurement, sweep: null, issues: e.issues, needsTemperature: needs };
			}
			return { measurement, sweep: null, issues: [{ message: (e as Error).message }], needsTemperature: false };
		}
	}

	/** The form fields the upload sends besides the file. */
	fields(): Record<string, string> {
		const f: Record<string, string> = { sample: this.sample.trim() };
		if (this.temperature.trim()) f.temperatureC = this.temperature.trim();
		if (this.excludeFrom.trim() || this.excludeTo.trim()) (f.excludeFromV = this.excludeFrom.trim()), (f.excludeToV = this.excludeTo.trim());
		f.measurement = this.measurement;
		if (this.measurement === 'cv') {
			if (this.frequency.trim()) f.frequencyHz = this.frequency.trim();
			if (this.level.trim()) f.testLevelV = this.level.trim();
			if (this.stray.trim()) f.strayCapacitanceF = this.stray.trim();
		}
		return f;
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
