/**
 * A fixed-window counter per key, kept in this process. Per-client limits only slow one
 * node's abuse; the per-address limit on sign-in links lives in PostgreSQL.
 */
export class WindowLimiter {
	private hits = new Map<string, { start: number; count: number }>();
	constructor(
		private readonly max: number,
		private readonly windowMs: number
	) {}

	allow(key: string, now = Date.now()): boolean {
		const entry = this.hits.get(key);
		if (!entry || now - entry.start >= this.windowMs) {
			if (this.hits.size > 10_000) this.hits.clear();
			this.hits.set(key, { start: now, count: 1 });
			return true;
		}
		entry.count += 1;
		return entry.count <= this.max;
	}
}

/** Sign-in requests per client address: 20 per 15 minutes. */
export const clientLimiter = new WindowLimiter(Number(process.env.SIGNIN_PER_CLIENT ?? 20), 15 * 60_000);
