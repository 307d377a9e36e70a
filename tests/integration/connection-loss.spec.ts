// What the database driver does when PostgreSQL drops a connection under the app — the
// cases our patch to postgres.js (patches/, applied by npm ci) exists for. Each was reported
// upstream against 3.4.9, the version we use, and is still open there:
//   porsager/postgres#1216 (work of a lost transaction runs on the next session),
//   #1208 / #1154 (a write to a closed connection throws from a timer: the process dies),
//   #1192 / #1205 (a failed type lookup on a new connection is an unhandled rejection).
// Unpatched, the first two cases end the test process (or commit a row that belonged to a
// transaction the caller was told had failed); the third reports an unhandled rejection.
import net from 'node:net';
import postgres from 'postgres';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { unique } from './helpers';

const url = process.env.DATABASE_URL!;
const TABLE = `connection_loss_${process.pid}`;
const options = { onnotice: () => {}, connect_timeout: 5, backoff: () => 0.05 };
const admin = postgres(url, { ...options, max: 1 });
const opened: postgres.Sql[] = [];

// `socket` (a connection of the caller's making) is a postgres.js option its types leave out.
type Extra = postgres.Options<Record<string, never>> & { socket?: () => net.Socket };

/** A client of its own with one connection, so "the next session" is that connection reused. */
function oneConnection(extra: Extra = {}) {
	const sql = postgres(url, { ...options, ...extra, max: 1 });
	opened.push(sql);
	return sql;
}

beforeAll(async () => {
	await admin.unsafe(`create table ${TABLE} (v text not null)`);
});

afterAll(async () => {
	await Promise.all(opened.map((sql) => sql.end({ timeout: 1 })));
	await admin.unsafe(`drop table if exists ${TABLE}`);
	await admin.end({ timeout: 1 });
});

const rows = async () => (await admin.unsafe(`select v from ${TABLE} order by v`)).map((r) => r.v as string);
const kill = (pid: number) => admin`select pg_terminate_backend(${pid})`;
const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

test('a transaction whose connection is lost fails as a whole: what its callback still asks for is refused, never written', async () => {
	const sql = oneConnection();
	const tag = unique('lost');
	const asked: string[] = [];
	const outcome = sql
		.begin(async (tx) => {
			const [{ pid }] = await tx`select pg_backend_pid() as pid`;
			await tx.unsafe(`insert into ${TABLE} values ($1)`, [`${tag} before`]);
			await kill(pid);
			await pause(300); // the close has arrived by now
			for (const v of [`${tag} small`, `${tag} large ${'x'.repeat(3000)}`]) {
				try {
					await tx.unsafe(`insert into ${TABLE} values ($1)`, [v]);
					asked.push('written');
				} catch (e) {
					asked.push((e as { code?: string }).code ?? String(e));
				}
			}
		})
		.then(
			() => 'committed',
			(e) => (e as { code?: string }).code
		);
	expect(await outcome).toBe('CONNECTION_CLOSED');
	// The connection is used again (max 1) while the old callback keeps going.
	await pause(100);
	expect(await sql`select 1 as one`).toEqual([{ one: 1 }]);
	await pause(400);
	expect(asked).toEqual(['CONNECTION_CLOSED', 'CONNECTION_CLOSED']);
	expect((await rows()).filter((v) => v.startsWith(tag))).toEqual([]);
	// And the reused connection keeps working, in and out of transactions.
	await sql.begin((tx) => tx.unsafe(`insert into ${TABLE} values ($1)`, [`${tag} after`]));
	expect((await rows()).filter((v) => v.startsWith(tag))).toEqual([`${tag} after`]);
});

test('a reserved connection written to after it was lost refuses the query instead of ending the process', async () => {
	const sql = oneConnection();
	const reserved = await sql.reserve();
	const [{ pid }] = await reserved`select pg_backend_pid() as pid`;
	await kill(pid);
	await pause(300);
	await expect(reserved`select 1`).rejects.toMatchObject({ code: 'CONNECTION_CLOSED' });
});

test('a connection that closes with a write still queued reconnects at once, without the stale bytes', async () => {
	// The close and the queued write race in a real outage (every connection closes at the
	// same moment); a socket of our own lets the test put the close first, every time.
	const sockets: net.Socket[] = [];
	const { hostname, port } = new URL(url);
	const sql = oneConnection({
		socket: () => {
			const s = net.connect(Number(port || 5432), hostname);
			sockets.push(s);
			return s;
		}
	});
	await sql`select 1`;
	const queued = sql`select 2 as two`.execute();
	await null; // the driver has queued the query's bytes for its next turn
	const socket = sockets.at(-1)!;
	socket.destroy();
	socket.emit('close', false);
	await expect(queued).rejects.toMatchObject({ code: 'CONNECTION_CLOSED' });
	const startedAt = Date.now();
	expect(await sql`select 3 as three`).toEqual([{ three: 3 }]);
	// Unpatched, the reconnection's first bytes are never sent and this waits for connect_timeout.
	expect(Date.now() - startedAt).toBeLessThan(options.connect_timeout * 1000);
	expect(sockets.length).toBe(2);
});

test('a new connection whose type lookup fails settles its query and leaves no unhandled rejection', async () => {
	const unhandled: unknown[] = [];
	const note = (e: unknown) => unhandled.push(e);
	process.on('unhandledRejection', note);
	try {
		// A 1 ms statement timeout cancels the driver's own first query (its array-type lookup)
		// on most connections; try a few, each new.
		for (let i = 0; i < 5; i++) {
			const sql = oneConnection({ connection: { statement_timeout: 1 } });
			await sql`select 1`.catch(() => {});
			await sql.end({ timeout: 1 });
		}
		await pause(100);
	} finally {
		process.off('unhandledRejection', note);
	}
	expect(unhandled).toEqual([]);
});
