/**
 * Live updates in the browser: one EventSource per page on /api/v1/events, shared by every
 * handler. The browser reconnects by itself after a broken stream; since changes may have
 * been missed meanwhile, each handler then hears "anything may have changed" (null ids).
 * Opened with the first handler, closed when the last one goes.
 */
export type LiveEvents = {
	models: { partIds: number[] | null };
	project: { projectId: number | null };
};
export type LiveKind = keyof LiveEvents;

const EVENTS_URL = '/api/v1/events';
const LINGER_MS = 1000;
const KINDS: LiveKind[] = ['models', 'project'];
const ANYTHING: { [K in LiveKind]: LiveEvents[K] } = { models: { partIds: null }, project: { projectId: null } };

type Handler = (data: never) => void;
const handlers: Record<LiveKind, Set<Handler>> = { models: new Set(), project: new Set() };
let source: EventSource | null = null;
let broken = false;

function deliver<K extends LiveKind>(kind: K, data: LiveEvents[K]): void {
	for (const h of [...handlers[kind]]) (h as (d: LiveEvents[K]) => void)(data);
}

function connect(): EventSource {
	const es = new EventSource(EVENTS_URL);
	es.addEventListener('open', () => {
		if (!broken) return;
		broken = false;
		for (const kind of KINDS) deliver(kind, ANYTHING[kind]);
	});
	// A broken stream: the browser retries on its own, unless the server refused it outright
	// (signed out, say); then try again a little later.
	es.addEventListener('error', () => {
		broken = true;
		if (es.readyState === EventSource.CLOSED && source === es) {
			source = null;
			setTimeout(() => {
				if (!source && KINDS.some((k) => handlers[k].size)) source = connect();
			}, 5000);
		}
	});
	for (const kind of KINDS) {
		es.addEventListener(kind, (e) => {
			try {
				deliver(kind, JSON.parse((e as MessageEvent<string>).data));
			} catch {
				// Not JSON: not ours to act on.
			}
		});
	}
	return es;
}

/** Calls `handler` on every event of `kind`; returns the function that stops it. */
export function onLiveEvent<K extends LiveKind>(kind: K, handler: (data: LiveEvents[K]) => void): () => void {
	if (typeof EventSource === 'undefined') return () => {};
	handlers[kind].add(handler as Handler);
	source ??= connect();
	return () => {
		handlers[kind].delete(handler as Handler);
		// Kept a moment: a screen that re-subscribes (new data, next page) reuses the stream.
		setTimeout(() => {
			if (KINDS.every((k) => handlers[k].size === 0) && source) {
				source.close();
				source = null;
				broken = false;
			}
		}, LINGER_MS);
	};
}

/**
 * Calls `refresh` (at most once per burst) when project `projectId` changes or the model of
 * one of the parts `partIds()` names does — what a project screen shows; `partIds` is read
 * when an event comes, so the subscription outlives the screen's data. A change heard while
 * a refresh is still loading gets a refresh of its own after it. Returns the function that stops it.
 */
export function followProject(projectId: number, partIds: () => Iterable<number>, refresh: () => unknown): () => void {
	let timer: ReturnType<typeof setTimeout> | null = null;
	let loading = false;
	let again = false;
	let stopped = false;
	const run = async () => {
		timer = null;
		if (loading) {
			again = true;
			return;
		}
		loading = true;
		try {
			await refresh();
		} finally {
			loading = false;
			if (again && !stopped) {
				again = false;
				soon();
			}
		}
	};
	const soon = () => {
		timer ??= setTimeout(run, 50);
	};
	const offProject = onLiveEvent('project', ({ projectId: id }) => {
		if (id === null || id === projectId) soon();
	});
	const offModels = onLiveEvent('models', ({ partIds: ids }) => {
		const parts = new Set(partIds());
		if (ids === null ? parts.size > 0 : ids.some((id) => parts.has(id))) soon();
	});
	return () => {
		stopped = true;
		if (timer) clearTimeout(timer);
		offProject();
		offModels();
	};
}
