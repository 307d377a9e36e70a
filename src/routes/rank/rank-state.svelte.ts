/**
 * The ranking screen's live state: the sentence's fields, the last ranking, and the
 * requests that keep it current. A change waits ~150 ms for more typing, aborts any
 * request still in flight, asks POST /api/v1/rank, and writes the operating point to
 * the address bar so the ranking can be bookmarked.
 *
 * `updates` counts rankings drawn: it is bumped in the same synchronous step that stores
 * the result, so Svelte writes the counter and the ranked list (rows, counts, flag legend)
 * to the DOM in one flush — when `data-updates` shows n, the list for ranking n is in the
 * document. The curves below the list follow within the next animation frame.
 */
import { replaceState } from '$app/navigation';
import {
	parseFields,
	queryFromFields,
	queryFromOperatingPoint,
	type FieldErrors,
	type OpFields
} from '$lib/rank/operating-point-url';
import type { RankOperatingPoint, RankResponse } from '$lib/schemas/rank';

export const DEBOUNCE_MS = 150;
/** The address bar is written at most this often while the fields keep changing (last write always lands). */
export const URL_WRITE_MS = 250;

export class RankState {
	fields: OpFields = $state() as OpFields;
	/** The last ranking; replaced whole, never edited, so it is not made deeply reactive. */
	result: RankResponse | null = $state.raw(null);
	/** The operating point `result` was ranked for (the fields may have moved on since). */
	rankedOp: RankOperatingPoint | null = $state.raw(null);
	pending = $state(false);
	failure: string | null = $state(null);
	/** Completed re-rankings since the page opened (read by the browser benchmark). */
	updates = $state(0);
	readonly parsed: { op: RankOperatingPoint | null; errors: FieldErrors } = $derived(parseFields(this.fields));
	private timer: ReturnType<typeof setTimeout> | null = null;
	private controller: AbortController | null = null;
	private urlTimer: ReturnType<typeof setTimeout> | null = null;
	private urlWritten = 0;

	constructor(
		fields: OpFields,
		result: RankResponse | null,
		private readonly rows: number,
		private readonly curves: number
	) {
		this.fields = fields;
		this.result = result;
		this.rankedOp = result ? this.parsed.op : null;
	}

	/** The query string for the current fields (canonical when they parse). */
	get query(): string {
		const op = this.parsed.op;
		return (op ? queryFromOperatingPoint(op) : queryFromFields(this.fields)).toString();
	}

	/** Call after any field changed. */
	changed(): void {
		if (this.timer) clearTimeout(this.timer);
		this.timer = setTimeout(() => {
			this.timer = null;
			void this.refresh();
		}, DEBOUNCE_MS);
	}

	/**
	 * Mirrors the fields into the URL: at once after a quiet spell, otherwise at most every
	 * URL_WRITE_MS with the latest fields (each history write costs the browser several ms,
	 * and Chromium refuses bursts of them).
	 */
	private writeUrl(): void {
		if (this.urlTimer) return; // a write is due and will take the latest fields
		const write = () => {
			this.urlTimer = null;
			this.urlWritten = performance.now();
			try {
				replaceState(`?${this.query}`, {});
			} catch {
				/* before the router is ready (first tick): the next change writes it */
			}
		};
		const wait = this.urlWritten + URL_WRITE_MS - performance.now();
		if (wait <= 0) write();
		else this.urlTimer = setTimeout(write, wait);
	}

	/** Re-ranks now (aborting an earlier request), and mirrors the fields into the URL. */
	async refresh(): Promise<void> {
		// An explicit refresh (Enter) makes a pending debounced one redundant.
		if (this.timer) clearTimeout(this.timer);
		this.timer = null;
		this.writeUrl();
		const op = this.parsed.op;
		if (!op) return;
		this.controller?.abort();
		const controller = new AbortController();
		this.controller = controller;
		this.pending = true;
		try {
			const res = await fetch('/api/v1/rank', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ ...op, limit: this.rows, withModels: this.curves }),
				signal: controller.signal
			});
			const body = await res.json();
			if (controller.signal.aborted) return;
			if (!res.ok) {
				this.failure = body?.error?.message ?? `The ranking failed (${res.status}).`;
				return;
			}
			this.failure = null;
			this.result = body as RankResponse;
			this.rankedOp = op;
			this.updates++;
		} catch (e) {
			if ((e as Error).name === 'AbortError') return;
			this.failure = 'The ranking could not be fetched; check the connection and change a field to retry.';
		} finally {
			if (this.controller === controller) {
				this.pending = false;
				this.controller = null;
			}
		}
	}
}
