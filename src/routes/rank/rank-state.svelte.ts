/**
 * The ranking screen's live state: the sentence's fields, the last ranking, and the
 * requests that keep it current. A change waits ~150 ms for more typing, aborts any
 * request still in flight, asks POST /api/v1/rank, and writes the operating point to
 * the address bar so the ranking can be bookmarked.
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

export class RankState {
	fields: OpFields = $state() as OpFields;
	result: RankResponse | null = $state(null);
	pending = $state(false);
	failure: string | null = $state(null);
	/** Completed re-rankings since the page opened (read by the browser benchmark). */
	updates = $state(0);
	readonly parsed: { op: RankOperatingPoint | null; errors: FieldErrors } = $derived(parseFields(this.fields));
	private timer: ReturnType<typeof setTimeout> | null = null;
	private controller: AbortController | null = null;

	constructor(
		fields: OpFields,
		result: RankResponse | null,
		private readonly rows: number,
		private readonly curves: number
	) {
		this.fields = fields;
		this.result = result;
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

	/** Re-ranks now (aborting an earlier request), and mirrors the fields into the URL. */
	async refresh(): Promise<void> {
		// An explicit refresh (Enter) makes a pending debounced one redundant.
		if (this.timer) clearTimeout(this.timer);
		this.timer = null;
		try {
			replaceState(`?${this.query}`, {});
		} catch {
			/* before the router is ready (first tick): the next change writes it */
		}
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
