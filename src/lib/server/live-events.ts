/**
 * Server-sent events for open screens: `models` when parts' models changed (after this
 * process's cache has rebuilt, so a screen that refetches gets the new numbers) and
 * `project` when a project's change has committed. One hub per process feeds every open
 * stream; it holds its listeners on the source only while at least one stream is open.
 *
 * Wire format (text/event-stream):
 *   event: models   data: {"partIds":[12,15]}   gathered over `coalesceMs`; null: any part
 *   event: project  data: {"projectId":7}       null: any project (the listener reconnected)
 *   `: keep-alive` comment every `heartbeatMs`, so proxies keep the connection open.
 */

/** Where changes come from: the model cache's rebuilds and its project channel. */
export type LiveSource = {
	onRebuild(listener: (partIds: number[] | null) => void): () => void;
	onProjectChange(listener: (projectId: number | null) => void): () => void;
};

export type LiveEventsOptions = {
	/** Window over which model changes are gathered into one event [ms]. */
	coalesceMs?: number;
	/** Interval of the keep-alive comment [ms]. */
	heartbeatMs?: number;
	/** How long a browser waits before reconnecting after the stream broke [ms]. */
	retryMs?: number;
};

type Client = { send: (chunk: string) => void; close: () => void };

const encoder = new TextEncoder();

export function formatEvent(event: string, data: unknown): string {
	return `event: ${event}\ndata: ${JSON.stringify(data)}\n\n`;
}

export class LiveEvents {
	private clients = new Set<Client>();
	private detach: (() => void) | null = null;
	/** Parts changed since the last `models` event; null once any part may have. */
	private pending: Set<number> | null = new Set();
	private flushTimer: ReturnType<typeof setTimeout> | null = null;
	private heartbeat: ReturnType<typeof setInterval> | null = null;

	constructor(
		private readonly source: LiveSource,
		private readonly options: LiveEventsOptions = {}
	) {}

	/** Open streams (clean-up checks). */
	get size(): number {
		return this.clients.size;
	}

	/** A new event stream; it ends when the reader cancels (the client went away) or on closeAll. */
	open(): ReadableStream<Uint8Array> {
		let client: Client;
		return new ReadableStream<Uint8Array>({
			start: (controller) => {
				let open = true;
				client = {
					send: (chunk) => {
						if (open) controller.enqueue(encoder.encode(chunk));
					},
					close: () => {
						if (!open) return;
						open = false;
						this.remove(client);
						controller.close();
					}
				};
				this.add(client);
				// The retry hint and a first comment: headers and a byte go out at once.
				client.send(`retry: ${this.options.retryMs ?? 2000}\n: connected\n\n`);
			},
			cancel: () => {
				this.remove(client);
			}
		});
	}

	/** Ends every open stream (server shutdown, so the process need not wait for them). */
	closeAll(): void {
		for (const c of [...this.clients]) c.close();
	}

	private add(client: Client): void {
		this.clients.add(client);
		if (this.detach) return;
		const offModels = this.source.onRebuild((ids) => this.modelsChanged(ids));
		const offProjects = this.source.onProjectChange((id) => this.broadcast(formatEvent('project', { projectId: id })));
		this.detach = () => {
			offModels();
			offProjects();
		};
		this.heartbeat = setInterval(() => this.broadcast(': keep-alive\n\n'), this.options.heartbeatMs ?? 15_000);
		this.heartbeat.unref?.();
	}

	private remove(client: Client): void {
		if (!this.clients.delete(client) || this.clients.size > 0) return;
		this.detach?.();
		this.detach = null;
		if (this.heartbeat) clearInterval(this.heartbeat);
		if (this.flushTimer) clearTimeout(this.flushTimer);
		this.heartbeat = null;
		this.flushTimer = null;
		this.pending = new Set();
	}

	private modelsChanged(ids: number[] | null): void {
		if (ids === null) this.pending = null;
		else if (this.pending) for (const id of ids) this.pending.add(id);
		if (this.flushTimer) return;
		this.flushTimer = setTimeout(() => {
			this.flushTimer = null;
			const partIds = this.pending ? [...this.pending].sort((a, b) => a - b) : null;
			this.pending = new Set();
			this.broadcast(formatEvent('models', { partIds }));
		}, this.options.coalesceMs ?? 100);
	}

	private broadcast(chunk: string): void {
		for (const c of this.clients) c.send(chunk);
	}
}

let shared: LiveEvents | null = null;

/** This process's hub over its model cache; streams end when the server shuts down. */
export async function liveEvents(): Promise<LiveEvents> {
	if (shared) return shared;
	const { modelCache } = await import('./model-cache');
	const cache = await modelCache();
	if (shared) return shared;
	const hub = new LiveEvents(cache);
	shared = hub;
	// adapter-node waits for open connections before it shuts down and these never end by
	// themselves. Only beside its handlers: a lone listener would keep the signal from ending the process.
	for (const signal of ['SIGTERM', 'SIGINT'] as const) {
		if (process.listenerCount(signal) > 0) process.once(signal, () => hub.closeAll());
	}
	return hub;
}
