/**
 * The ranking screen's live state: the sentence's fields, the last ranking, and the
 * rankings that keep it current, written to the address bar so they can be bookmarked.
 *
 * Once the ranking worker holds the model snapshot (browser-ranker.ts), a change is ranked
 * there at once, one ranking at a time (the latest fields win), and its result is shown at
 * most once per animation frame. Until then, or without it (a catalogue too large for the
 * snapshot, a worker that failed), a change waits ~150 ms for more typing, aborts any
 * request still in flight and asks POST /api/v1/rank.
 *
 * `updates` counts rankings drawn: it is bumped in the same synchronous step that stores
 * the result, so Svelte writes the counter, the ranked list (rows, counts, flag legend) and
 * the curves to the DOM in one flush — when `data-updates` shows n, ranking n is drawn.
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
import type { BrowserRanker } from '$lib/rank/browser-ranker';

export const DEBOUNCE_MS = 150;
/** The address bar is written once the fields have kept still this long. */
export const URL_SETTLE_MS = 250;
/** A ranking in the browser that takes longer than this shows "Updating…" (a quicker one would only flicker it). */
const SLOW_RANK_MS = 120;

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
	/** The query string for the current fields (canonical when they parse); made once per change, read by several links. */
	readonly query: string = $derived.by(() => {
		const op = this.parsed.op;
		return (op ? queryFromOperatingPoint(op) : queryFromFields(this.fields)).toString();
	});
	private timer: ReturnType<typeof setTimeout> | null = null;
	private controller: AbortController | null = null;
	private urlTimer: ReturnType<typeof setTimeout> | null = null;
	/** Ranks in the browser once set (its snapshot loaded). */
	private ranker: BrowserRanker | null = $state.raw(null);
	private ranking = false;
	/** The fields changed while a ranking was in the worker: rank again when it answers. */
	private again = false;
	/** A result waiting for the next animation frame (one was already shown in this one). */
	private held: { result: RankResponse; op: RankOperatingPoint } | null = null;
	private shownThisFrame = false;

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


	/** Rank in the browser from now on (the worker holds the snapshot), or on the server again (null). */
	rankInBrowser(ranker: BrowserRanker | null): void {
		this.ranker = ranker;
		// Fields changed while the snapshot loaded and their ranking is not shown yet: rank them here.
		if (ranker && (this.timer || this.controller)) this.changed();
	}

	/** The catalogue changed under the ranking on screen: rank the same fields again. */
	rerank(): void {
		if (this.ranker) void this.rankHere();
		else void this.refresh();
	}

	/** Whether rankings are made in the browser. */
	get inBrowser(): boolean {
		return this.ranker !== null;
	}

	/** Call after any field changed. */
	changed(): void {
		if (this.ranker) {
			if (this.timer) clearTimeout(this.timer);
			this.timer = null;
			this.writeUrl();
			void this.rankHere();
			return;
		}
		if (this.timer) clearTimeout(this.timer);
		this.timer = setTimeout(() => {
			this.timer = null;
			void this.refresh();
		}, DEBOUNCE_MS);
	}

	/**
	 * Mirrors the fields into the URL once they keep still for URL_SETTLE_MS: a history write
	 * costs the browser several ms (and the page's reactions to it more), which dropped a
	 * frame at every write while a slider moved; Chromium also refuses bursts of them.
	 */
	private writeUrl(): void {
		if (this.urlTimer) clearTimeout(this.urlTimer);
		const path = location.pathname;
		this.urlTimer = setTimeout(() => {
			this.urlTimer = null;
			// Gone to another page meanwhile: its address is not ours to write.
			if (location.pathname !== path) return;
			try {
				replaceState(`?${this.query}`, {});
			} catch {
				/* before the router is ready (first tick): the next change writes it */
			}
		}, URL_SETTLE_MS);
	}

	/** Ranks the current fields in the worker; changes meanwhile are ranked next, the latest only. */
	private async rankHere(): Promise<void> {
		if (this.ranking) {
			this.again = true;
			return;
		}
		const ranker = this.ranker;
		const op = this.parsed.op;
		if (!ranker || !op) return;
		this.ranking = true;
		const slow = setTimeout(() => (this.pending = true), SLOW_RANK_MS);
		try {
			const result = await ranker.rank(op, this.rows, this.curves);
			if (this.ranker === ranker) this.show(result, op);
		} catch (e) {
			if (this.ranker === ranker) this.failure = `The ranking failed: ${(e as Error).message}`;
		} finally {
			clearTimeout(slow);
			this.pending = false;
			this.ranking = false;
		}
		if (this.again) {
			this.again = false;
			void this.rankHere();
		}
	}

	/** Shows a result now, or at the next animation frame when one was shown in this one. */
	private show(result: RankResponse, op: RankOperatingPoint): void {
		if (this.shownThisFrame) {
			const first = this.held === null;
			this.held = { result, op };
			if (first)
				requestAnimationFrame(() => {
					const h = this.held;
					this.held = null;
					this.shownThisFrame = false;
					if (h) this.show(h.result, h.op);
				});
			return;
		}
		// A server answer still on its way would be older than this one.
		this.controller?.abort();
		this.failure = null;
		this.result = result;
		this.rankedOp = op;
		this.updates++;
		this.shownThisFrame = true;
		requestAnimationFrame(() => {
			if (!this.held) this.shownThisFrame = false;
		});
	}

	/** Re-ranks now (aborting an earlier request), and mirrors the fields into the URL. */
	async refresh(): Promise<void> {
		if (this.ranker) return this.changed();
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
