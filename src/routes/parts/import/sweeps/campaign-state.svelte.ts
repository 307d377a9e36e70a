// The sweep-import screen's state: the chosen files, their mapping by the pattern, and the
// run's per-file outcomes as they arrive.
import { unzipSync } from 'fflate';
import { DEFAULT_PATTERN } from '$lib/catalogue/file-pattern';
import { planCampaign, runCampaign, runsUploader, summaryCsv, tally, type CampaignFile, type CampaignPart, type FileOutcome } from '$lib/catalogue/campaign';

const SWEEP_NAME = /\.(csv|txt|dat|tsv)$/i;

/**
 * The files of a .zip. fflate's worker-based unzip needs a script from a blob: address, which
 * the site's content security policy refuses; a bench folder's zip of a few megabytes is
 * read in milliseconds, so it is read here.
 */
function unzipFiles(bytes: Uint8Array): CampaignFile[] {
	let out: Record<string, Uint8Array>;
	try {
		out = unzipSync(bytes, { filter: (f) => SWEEP_NAME.test(f.name) && !f.name.startsWith('__MACOSX/') });
	} catch (e) {
		throw new Error(`the .zip cannot be read: ${(e as Error).message}`);
	}
	return Object.entries(out).map(([path, data]) => ({ path, bytes: async () => data }));
}

export class Campaign {
	private parts: () => CampaignPart[] = () => [];
	pattern = $state(DEFAULT_PATTERN);
	files = $state<CampaignFile[]>([]);
	outcomes = $state<FileOutcome[]>([]);
	running = $state(false);
	finished = $state(false);
	note = $state('');

	constructor(parts: () => CampaignPart[]) {
		this.parts = parts;
	}

	plan = $derived(planCampaign(this.files.map((f) => f.path), this.pattern, this.parts()));
	mapped = $derived(this.plan.filter((p) => p.target).length);
	done = $derived(this.outcomes.filter((o) => !['waiting', 'reading', 'uploading'].includes(o.state)).length);
	counts = $derived(tally(this.outcomes));

	async add(list: FileList | File[]) {
		this.note = '';
		const found: CampaignFile[] = [];
		for (const file of Array.from(list)) {
			const path = (file as File & { webkitRelativePath?: string }).webkitRelativePath || file.name;
			if (/\.zip$/i.test(file.name)) {
				try {
					found.push(...unzipFiles(new Uint8Array(await file.arrayBuffer())));
				} catch (e) {
					this.note = (e as Error).message;
				}
			} else if (SWEEP_NAME.test(file.name)) found.push({ path, bytes: async () => new Uint8Array(await file.arrayBuffer()) });
		}
		const known = new Set(this.files.map((f) => f.path));
		this.files = [...this.files, ...found.filter((f) => !known.has(f.path))].sort((a, b) => a.path.localeCompare(b.path, undefined, { numeric: true }));
		this.outcomes = [];
		this.finished = false;
		if (!found.length && !this.note) this.note = 'No sweep files (.csv, .txt, .dat, .tsv) were found in what you chose.';
	}

	clear() {
		this.files = [];
		this.outcomes = [];
		this.finished = false;
	}

	async start() {
		const plan = this.plan;
		this.running = true;
		this.finished = false;
		this.outcomes = plan.map(() => ({ state: 'waiting', message: '', runId: null, sha256: null }));
		const byPath = new Map(this.files.map((f) => [f.path, f]));
		await runCampaign(plan, byPath, runsUploader(), { concurrency: 3, onChange: (k, o) => (this.outcomes[k] = o) });
		this.running = false;
		this.finished = true;
	}

	/** The summary as a CSV file the browser downloads. */
	summaryUrl(): string {
		return URL.createObjectURL(new Blob([summaryCsv(this.plan, this.outcomes)], { type: 'text/csv;charset=utf-8' }));
	}
}
