import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as schema from './schema';

// process.env rather than $env so the seed, the CLI and the tests share this module.
const url = process.env.DATABASE_URL;
if (!url) throw new Error('DATABASE_URL is not set (npm start and npm test set it)');

export const client = postgres(url, {
	max: Number(process.env.DB_POOL_MAX ?? 10),
	onnotice: () => {},
	connect_timeout: 5
});
export const db = drizzle(client, { schema });
export type Db = typeof db;
/** A transaction handle, accepted wherever a write must join the caller's transaction. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];
export type DbOrTx = Db | Tx;
export { schema };
