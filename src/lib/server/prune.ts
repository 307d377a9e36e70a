import { lt } from 'drizzle-orm';
import { db } from './db';
import { rateLimits, sessions, verificationTokens } from './db/schema';

/**
 * Deletes what has outlived its use: expired browser sessions (Auth.js's session maxAge
 * sets their expiry), sign-in links past their expiry (a used link is deleted by Auth.js
 * when it is opened) and finished rate-limit windows. Safe to run in every app process at
 * once: each statement only deletes rows that are already dead.
 */
export async function pruneExpired(now = new Date()) {
	const [s, v, r] = await Promise.all([
		db.delete(sessions).where(lt(sessions.expires, now)).returning({ k: sessions.sessionToken }),
		db.delete(verificationTokens).where(lt(verificationTokens.expires, now)).returning({ k: verificationTokens.token }),
		db.delete(rateLimits).where(lt(rateLimits.windowEndsAt, now)).returning({ k: rateLimits.key })
	]);
	return { sessions: s.length, signInLinks: v.length, rateLimits: r.length };
}

let timer: ReturnType<typeof setInterval> | null = null;

/** Prunes shortly after start and then every `everyMs` (PRUNE_EVERY_MS, default one hour). */
export function startPruning(everyMs = Number(process.env.PRUNE_EVERY_MS ?? 3_600_000)) {
	if (timer) return;
	const run = () => {
		// A database outage only delays the next pass.
		pruneExpired().catch(() => {});
	};
	setTimeout(run, Math.min(everyMs, 10_000)).unref?.();
	timer = setInterval(run, everyMs);
	timer.unref?.();
}

export function stopPruning() {
	if (timer) clearInterval(timer);
	timer = null;
}
