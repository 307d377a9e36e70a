/// <reference lib="webworker" />
/**
 * The ranking worker: holds the catalogue's model snapshot and ranks it with the engine
 * off the page's thread. The snapshot comes whole once (the browser keeps it and
 * revalidates it by ETag); after a change only the changed parts are fetched.
 */
import { SnapshotCatalogue } from './snapshot-catalogue';
import { MAX_SNAPSHOT_PART_IDS, SNAPSHOT_PATH, type FromWorker, type ToWorker } from './rank-worker-protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const catalogue = new SnapshotCatalogue();
/** Changes are fetched one after another, so a later answer never lands before an earlier one. */
let fetching: Promise<void> = Promise.resolve();

const post = (m: FromWorker) => scope.postMessage(m);

async function fetchSnapshot(query: string): Promise<number> {
	const res = await fetch(new URL(SNAPSHOT_PATH + query, scope.location.origin), { credentials: 'same-origin' });
	if (!res.ok) throw new Error(`the model snapshot could not be fetched (${res.status})`);
	const bytes = await res.arrayBuffer();
	catalogue.applyBytes(bytes);
	return bytes.byteLength;
}

function load(): Promise<void> {
	const t0 = performance.now();
	return fetchSnapshot('').then(
		(bytes) => post({ type: 'loaded', version: catalogue.version!, parts: catalogue.size, bytes, ms: performance.now() - t0 }),
		(e: Error) => post({ type: 'load-failed', message: e.message })
	);
}

function changed(partIds: number[] | null): Promise<void> {
	if (partIds?.length === 0) return Promise.resolve();
	const t0 = performance.now();
	// Named parts when few; otherwise what changed since the version held (all, if the server no longer knows it).
	const query =
		partIds && partIds.length <= MAX_SNAPSHOT_PART_IDS
			? `?parts=${partIds.join(',')}`
			: catalogue.version
				? `?since=${encodeURIComponent(catalogue.version)}`
				: '';
	return fetchSnapshot(query).then(
		(bytes) => post({ type: 'loaded', version: catalogue.version!, parts: catalogue.size, bytes, ms: performance.now() - t0 }),
		(e: Error) => post({ type: 'load-failed', message: e.message })
	);
}

scope.onmessage = (event: MessageEvent<ToWorker>) => {
	const m = event.data;
	if (m.type === 'load') fetching = fetching.then(load);
	else if (m.type === 'changed') fetching = fetching.then(() => changed(m.partIds));
	else if (m.type === 'rank') {
		const t0 = performance.now();
		try {
			const result = catalogue.rank(m.op, m.limit, m.withModels);
			post({ type: 'ranked', seq: m.seq, result, ms: performance.now() - t0 });
		} catch (e) {
			post({ type: 'rank-failed', seq: m.seq, message: (e as Error).message });
		}
	}
};
