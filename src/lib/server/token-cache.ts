/**
 * Who each API token belongs to, held in memory so an API request does not ask PostgreSQL
 * every time. Access changes reach it at once:
 *  - every write that revokes a token, deactivates or reactivates a person or changes their
 *    roles or name announces the person on PEOPLE_CHANNEL inside its transaction, so every
 *    process hears it as soon as it commits (and forgets that person's tokens);
 *  - the process that made the change also forgets them itself right after the commit, so its
 *    own next request never depends on the notification's arrival;
 *  - the end date is kept with the entry and checked on every request.
 * Entries are used only while the listener is known to hear: it pings itself every PING_MS
 * with the time of sending, and since one connection hears notifications in commit order, a
 * ping heard means every announcement committed before it was sent has been heard too. The
 * cache is bypassed (and emptied) when the newest ping heard was sent more than HEARING_MS
 * ago, as during an outage; a listener that heard nothing for DEAF_MS is replaced. Each
 * (re)connection of the listener empties it too (anything may have been missed), and an
 * entry is re-read after MAX_AGE_MS at the latest, which bounds what an edit made outside
 * the app (SQL by hand) can leave behind.
 */
import { randomBytes } from 'node:crypto';
import { sql as raw } from 'drizzle-orm';
import type { Sql } from 'postgres';
import { listeningClient, type DbOrTx } from './db';
import type { Person } from './people';

/** PostgreSQL channel on which a change to a person's access is announced (payload: their id). */
export const PEOPLE_CHANNEL = 'junction_people';

const PING_MS = 1000;
/** Entries are trusted while every announcement committed up to this long ago is known heard. */
const HEARING_MS = 3000;
/** A listener that heard none of its pings for this long is replaced. */
const DEAF_MS = 10_000;
const MAX_AGE_MS = 60_000;

export type TokenEntry = { person: Person; tokenId: number; expiresAt: number | null; lastUsedAt: number | null };

/** Announces that a person's access changed; heard by every process once `tx` commits. */
export async function announcePersonChanged(tx: DbOrTx, userId: string): Promise<void> {
	await tx.execute(raw`select pg_notify(${PEOPLE_CHANNEL}, ${userId})`);
}

class TokenCache {
	private entries = new Map<string, TokenEntry & { at?: number }>();
	/** Bumped on every forgetting: a lookup that raced one does not store what it read. */
	private generation = 0;
	private listener: Sql | null = null;
	private starting: Promise<void> | null = null;
	private timer: ReturnType<typeof setInterval> | null = null;
	private readonly pingPrefix = `ping:${randomBytes(6).toString('hex')}:`;
	private pingSent = 0;
	/** When the newest ping heard was sent. */
	private heardAt = 0;
	/** When the current listener was opened (it gets DEAF_MS to hear its first ping). */
	private listenedAt = 0;

	/** The entry for this token digest, when the cache may be trusted and holds one. */
	get(digest: string): TokenEntry | null {
		this.start();
		if (!this.hearing()) {
			if (this.entries.size) this.forgetAll();
			return null;
		}
		const e = this.entries.get(digest);
		if (!e) return null;
		if (Date.now() - (e.at ?? 0) > MAX_AGE_MS) {
			this.entries.delete(digest);
			return null;
		}
		return e;
	}

	/** The generation to hand back to `set` after reading from the database. */
	get current(): number {
		return this.generation;
	}

	/** Keeps what a lookup read at generation `readAt` (the entry itself: its last use is updated in place). */
	set(digest: string, entry: TokenEntry, readAt: number): void {
		if (readAt !== this.generation || !this.hearing()) return;
		this.entries.set(digest, Object.assign(entry, { at: Date.now() }));
	}

	forgetPerson(userId: string): void {
		this.generation++;
		for (const [digest, e] of this.entries) if (e.person.id === userId) this.entries.delete(digest);
	}

	forgetAll(): void {
		this.generation++;
		this.entries.clear();
	}

	private hearing(): boolean {
		return Date.now() - this.heardAt < HEARING_MS;
	}

	private start(): void {
		if (this.timer || !process.env.DATABASE_URL) return;
		this.timer = setInterval(() => void this.tick(), PING_MS);
		this.timer.unref?.();
		void this.tick();
	}

	/** Opens the listener; each (re)connection empties the cache. */
	private async listen(): Promise<void> {
		const listener = listeningClient();
		this.listener = listener;
		await listener.listen(
			PEOPLE_CHANNEL,
			(payload) => {
				if (!payload.startsWith('ping:')) this.forgetPerson(payload);
				else if (payload.startsWith(this.pingPrefix)) this.heardAt = Math.max(this.heardAt, Number(payload.slice(this.pingPrefix.length)) || 0);
			},
			() => this.forgetAll()
		);
	}

	/** One ping; a listener that has heard nothing for DEAF_MS is replaced first. */
	private async tick(): Promise<void> {
		if (this.starting) return;
		this.starting = (async () => {
			if (!this.listener || (this.pingSent > 0 && Date.now() - Math.max(this.heardAt, this.listenedAt) > DEAF_MS)) {
				const old = this.listener;
				this.listener = null;
				this.forgetAll();
				if (old) await old.end({ timeout: 0 }).catch(() => {});
				this.listenedAt = Date.now();
				await this.listen();
			}
			this.pingSent++;
			// Sent on the listener's own client, not the app's pool: a busy pool queues it behind
			// requests, which would make a listener that hears well look deaf.
			const listener = this.listener;
			if (listener) await listener`select pg_notify(${PEOPLE_CHANNEL}, ${this.pingPrefix + Date.now()})`;
		})()
			.catch(() => {
				// The database is unavailable: lookups go to it (and answer 503) until a ping is heard.
			})
			.finally(() => {
				this.starting = null;
			});
		await this.starting;
	}

	/** Stops listening (shutdown). */
	async close(): Promise<void> {
		if (this.timer) clearInterval(this.timer);
		this.timer = null;
		this.forgetAll();
		await this.listener?.end({ timeout: 1 }).catch(() => {});
		this.listener = null;
	}
}

export const tokenCache = new TokenCache();
