/**
 * The page's side of the ranking worker: loads the model snapshot once, ranks an operating
 * point off the page's thread, and passes on which parts changed. One ranking is asked for
 * at a time by the caller (RankState); answers come back in the order asked.
 */
import type { RankOperatingPoint, RankResponse } from '$lib/schemas/rank';
import type { FromWorker, ToWorker } from './rank-worker-protocol';

export type SnapshotLoaded = { version: string; parts: number; bytes: number; ms: number };

export class BrowserRanker {
	private readonly worker: Worker;
	private seq = 0;
	private readonly waiting = new Map<number, { resolve: (r: RankResponse) => void; reject: (e: Error) => void }>();
	private loadedOnce = false;
	/** Resolves once the first snapshot is in the worker; rejects when it cannot be had. */
	readonly ready: Promise<SnapshotLoaded>;
	/** Called after every snapshot the worker took in after the first (a change arrived). */
	onReloaded: ((loaded: SnapshotLoaded) => void) | null = null;

	constructor() {
		this.worker = new Worker(new URL('./rank.worker.ts', import.meta.url), { type: 'module', name: 'ranking' });
		let settle!: { resolve: (l: SnapshotLoaded) => void; reject: (e: Error) => void };
		this.ready = new Promise((resolve, reject) => (settle = { resolve, reject }));
		this.ready.catch(() => {}); // the caller decides; an unread failure is not an error here
		this.worker.onmessage = (event: MessageEvent<FromWorker>) => {
			const m = event.data;
			if (m.type === 'loaded') {
				const { type: _, ...loaded } = m;
				if (!this.loadedOnce) {
					this.loadedOnce = true;
					settle.resolve(loaded);
				} else this.onReloaded?.(loaded);
			} else if (m.type === 'load-failed') {
				if (!this.loadedOnce) settle.reject(new Error(m.message));
			} else {
				const w = this.waiting.get(m.seq);
				this.waiting.delete(m.seq);
				if (m.type === 'ranked') w?.resolve(m.result);
				else w?.reject(new Error(m.message));
			}
		};
		this.worker.onerror = (e) => {
			if (!this.loadedOnce) settle.reject(new Error(e.message || 'the ranking worker failed'));
		};
		this.send({ type: 'load' });
	}

	private send(m: ToWorker) {
		this.worker.postMessage(m);
	}

	/** Ranks in the worker and lists the best `limit`, the first `withModels` with their typical model. */
	rank(op: RankOperatingPoint, limit: number, withModels: number): Promise<RankResponse> {
		const seq = ++this.seq;
		return new Promise((resolve, reject) => {
			this.waiting.set(seq, { resolve, reject });
			// $state proxies cannot be cloned into the worker: plain data only.
			this.send({ type: 'rank', seq, op: JSON.parse(JSON.stringify(op)), limit, withModels });
		});
	}

	/** Some parts' models changed (null: any or all): the worker fetches only those. */
	changed(partIds: number[] | null): void {
		this.send({ type: 'changed', partIds });
	}

	dispose(): void {
		this.worker.terminate();
		for (const w of this.waiting.values()) w.reject(new Error('the ranking worker was stopped'));
		this.waiting.clear();
	}
}
