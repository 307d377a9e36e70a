// The event hub without a database: the wire format of the WHATWG HTML "server-sent events"
// section (event/data lines, blank-line terminated, ':' comments), model changes gathered
// into one event, and listeners released when the last stream goes.
import { describe, expect, test } from 'vitest';
import { LiveEvents, type LiveSource } from './live-events';

function fakeSource() {
	const rebuild = new Set<(ids: number[] | null) => void>();
	const project = new Set<(id: number | null) => void>();
	const source: LiveSource = {
		onRebuild: (l) => (rebuild.add(l), () => rebuild.delete(l)),
		onProjectChange: (l) => (project.add(l), () => project.delete(l))
	};
	return { source, rebuild, project };
}

async function readUntil(reader: ReadableStreamDefaultReader<Uint8Array>, marker: string): Promise<string> {
	const decoder = new TextDecoder();
	let text = '';
	while (!text.includes(marker)) text += decoder.decode((await reader.read()).value);
	return text;
}

describe('live event hub', () => {
	test('model changes within the window leave as one event; a full re-read as null', async () => {
		const { source, rebuild } = fakeSource();
		const hub = new LiveEvents(source, { coalesceMs: 30 });
		const reader = hub.open().getReader();
		expect(await readUntil(reader, '\n\n')).toBe('retry: 2000\n: connected\n\n');
		for (const l of rebuild) l([15]);
		for (const l of rebuild) l([12, 15]);
		expect(await readUntil(reader, '\n\n')).toBe('event: models\ndata: {"partIds":[12,15]}\n\n');
		for (const l of rebuild) l([3]);
		for (const l of rebuild) l(null);
		expect(await readUntil(reader, '\n\n')).toBe('event: models\ndata: {"partIds":null}\n\n');
		await reader.cancel();
	});

	test('project changes go out at once; heartbeats are comments', async () => {
		const { source, project } = fakeSource();
		const hub = new LiveEvents(source, { heartbeatMs: 20 });
		const reader = hub.open().getReader();
		await readUntil(reader, 'connected\n\n');
		expect(await readUntil(reader, '\n\n')).toBe(': keep-alive\n\n');
		for (const l of project) l(7);
		expect(await readUntil(reader, 'projectId')).toContain('event: project\ndata: {"projectId":7}\n\n');
		await reader.cancel();
	});

	test('listeners are held only while a stream is open', async () => {
		const { source, rebuild, project } = fakeSource();
		const hub = new LiveEvents(source);
		const a = hub.open().getReader();
		const b = hub.open().getReader();
		expect([hub.size, rebuild.size, project.size]).toEqual([2, 1, 1]);
		await a.cancel();
		expect([hub.size, rebuild.size, project.size]).toEqual([1, 1, 1]);
		hub.closeAll();
		expect(await readUntil(b, 'connected\n\n')).toContain('retry:');
		expect((await b.read()).done).toBe(true);
		expect([hub.size, rebuild.size, project.size]).toEqual([0, 0, 0]);
	});
});
