import { sql } from 'drizzle-orm';
import { db, type DbOrTx } from './db';
import { rateLimits } from './db/schema';

/**
 * Counts one hit on `key` in a fixed window of `windowMs` and says whether it is within
 * `max`. The count lives in PostgreSQL and is taken by one upsert on the database clock,
 * so every app process behind a proxy shares it and two hits at once cannot both slip in.
 */
export async function hitLimit(key: string, max: number, windowMs: number, tx: DbOrTx = db): Promise<boolean> {
	const window = sql`make_interval(secs => ${windowMs / 1000})`;
	const expired = sql`${rateLimits.windowEndsAt} <= now()`;
	const [row] = await tx
		.insert(rateLimits)
		.values({ key, hits: 1, windowEndsAt: sql`now() + ${window}` })
		.onConflictDoUpdate({
			target: rateLimits.key,
			set: {
				hits: sql`case when ${expired} then 1 else ${rateLimits.hits} + 1 end`,
				windowEndsAt: sql`case when ${expired} then excluded.window_ends_at else ${rateLimits.windowEndsAt} end`
			}
		})
		.returning({ hits: rateLimits.hits });
	return row.hits <= max;
}

const SIGN_IN_WINDOW_MS = 15 * 60_000;

/**
 * Sign-in requests per client address: 20 per 15 minutes (SIGNIN_PER_CLIENT changes the
 * number). Behind a reverse proxy the address is the one adapter-node reads from
 * ADDRESS_HEADER / XFF_DEPTH.
 */
export function allowSignInFrom(clientAddress: string): Promise<boolean> {
	return hitLimit(`sign-in:${clientAddress}`, Number(process.env.SIGNIN_PER_CLIENT ?? 20), SIGN_IN_WINDOW_MS);
}
