// One file on the upload page: its preview (parsed in the browser with the engine's CSV
// readers, I–V or C–V as the header says or the librarian chooses), its upload and fit
// state, and the server's answer.
import { parseCapacitanceCsv, parseSweepCsv, sweepKindOf, SweepError, type ParsedCapacitanceSweep, type ParsedSweep } from '$lib/junction';
import type { DataIssue } from '$lib/junction';
import { readQuantity } from '$lib/quantity';
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

/**
 * reading: the browser is reading the file; ready: waiting for Fit (a temperature is
 * missing, or something changed since the last fit); problem: the browser's own reading
 * found what stops a fit; refused: the server refused it; failed: it never got an answer.
 */
export type Phase = 'reading' | 'ready' | 'uploading' | 'fitting' | 'fitted' | 'storing' | 'stored' | 'problem' | 'refused' | 'failed';

/** What went wrong, in words: a sentence and, for files, the rows and columns it concerns. */
export type Problem = { message: string; issues?: DataIssue[] };

let made = 0;

export class Intake {
	file: File;
	/** Unique on the page, for element ids (file names may hold spaces). */
	readonly key = ++made;
	/** Set once the file's text has been read (an empty file reads as ''). */
	read = $state(false);
	text = $state('');
	sample = $state('');
	temperature = $state('');
	phase = $state<Phase>('reading');
	/** Upload progress 0…1 (bytes sent / total, from XMLHttpRequest). */
	progress = $state(0);
	answer = $state<FitAnswer | null>(null);
	error = $state<Problem | null>(null);
	excludeFrom = $state('');
	excludeTo = $state('');
	/** The temperature box was filled with 25 °C because neither the file nor its name says. */
	assumedTemperature = $state(false);
	/** Sample, temperature and window the shown fit was made with. */
	fittedWith = $state<string | null>(null);
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

	/** What a fit is made with now; when it differs from `fittedWith`, the fit on screen is out of date. */
	get settings(): string {
		const cv = this.measurement === 'cv' ? [this.frequency, this.level, this.stray] : [];
		return [this.measurement, this.sample, this.temperature, this.excludeFrom, this.excludeTo, ...cv].map((x) => x.trim()).join('|');
	}

	get stale(): boolean {
		return this.answer !== null && this.fittedWith !== this.settings;
	}

	/** The temperature box as read by the engine's parser (null when empty). */
	get temperatureReading() {
		return readQuantity(this.temperature, 'temperature');
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
		if (!this.read) return { measurement, sweep: null, issues: [], needsTemperature: false };
		const t = this.temperatureReading;
		const opts = { temperatureC: t?.ok ? t.value : undefined };
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

/** A server's JSON error (or a body that is not JSON) in words, without status codes. */
export function problemFrom(status: number, body: unknown): Problem {
	const e = (body as { error?: { message?: string; issues?: (DataIssue & { path?: string })[] } } | null)?.error;
	if (e?.message) {
		// Issues that only repeat the message (a single field's complaint) are not shown twice.
		const issues = (e.issues ?? []).filter((i) => i.message !== e.message && !e.message!.includes(i.message));
		return { message: e.message, issues };
	}
	if (status === 413) return { message: 'The file is larger than the server accepts. Nothing was stored.' };
	if (status >= 500) return { message: 'The server could not take the file just now. Nothing was stored; press Fit to try again.' };
	return { message: 'The server answered in a way this page did not expect. Nothing was stored; press Fit to try again.' };
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
				body = null;
			}
			resolve({ status: xhr.status, body });
		};
		xhr.onerror = () => reject(new Error('The connection failed during the upload. Nothing was stored; press Fit to try again.'));
		xhr.send(form);
	});
}
