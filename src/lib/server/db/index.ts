import { drizzle } from 'drizzle-orm/postgres-js';
import postgres, { type Options } from 'postgres';
import * as schema from './schema';

// process.env rather than $env so the seed, the CLI and the tests share this module.
const url = process.env.DATABASE_URL;

export const DATABASE_URL_MISSING =
	'DATABASE_URL is not set: give the PostgreSQL database to use, e.g. postgres://junctionary@db.example:5432/junctionary (npm start and npm test set it for their own clusters).';

// Without a URL (vite build imports the server modules without running them) every query
// fails with the message above instead of the import failing.
const options: Options<Record<string, never>> = {
	onnotice: () => {},
	connect_timeout: 5,
	// Seconds before reconnecting after the n-th failure in a row. The count is shared by the
	// whole pool, so every connection's failure raises it and a short outage soon reaches the
	// cap: the driver's own grows to 20 s. Capped at 0.2 s, requests succeed within about that
	// once PostgreSQL accepts connections again; while it is down each connection tries five
	// times a second, and a refused connection costs next to nothing.
	backoff: (attempts: number) => Math.min(0.05 * 2 ** attempts, 0.2),
	...(url
		? {}
		: {
				socket: () => {
					throw new Error(DATABASE_URL_MISSING);
				}
			})
};

export const client = url
	? postgres(url, { ...options, max: Number(process.env.DB_POOL_MAX ?? 10) })
	: postgres({ ...options, max: 1 });
export const db = drizzle(client, { schema });

/** A new client of its own, used only to LISTEN (the model cache replaces it when it goes deaf). */
export function listeningClient() {
	return url ? postgres(url, { ...options, max: 1 }) : postgres({ ...options, max: 1 });
}

export type Db = typeof db;
/** A transaction handle, accepted wherever a write must join the caller's transaction. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;
export { schema };
