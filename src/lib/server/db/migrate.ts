import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { drizzle } from 'drizzle-orm/postgres-js';
import { migrate } from 'drizzle-orm/postgres-js/migrator';
import postgres from 'postgres';
import * as schema from './schema';
import type { MigrationFills } from '../part-models';

/** Any fixed number: the advisory lock that lets one process at a time migrate. */
const MIGRATION_LOCK = 7_310_415_011;

/** The generated SQL migrations: drizzle/ in the checkout the server is started from. */
export function migrationsFolder(env = process.env): string {
	return resolve(env.MIGRATIONS_DIR ?? 'drizzle');
}

/**
 * Applies the migrations in drizzle/ that the database has not seen, then fills in what they
 * leave to the app's own code (part-models.ts `fillAfterMigrations`: capacitance, sample units).
 * Several app servers starting at once take turns on a PostgreSQL advisory lock, so each
 * migration and each fill runs once. Returns how many parts each fill step changed.
 */
export async function applyMigrations(url: string, folder = migrationsFolder()): Promise<MigrationFills> {
	if (!existsSync(resolve(folder, 'meta/_journal.json'))) {
		throw new Error(`No migrations in ${folder}: start the server from the Junctionary checkout, or set MIGRATIONS_DIR to its drizzle/ folder.`);
	}
	// One connection, so the lock, the migrations and the fills share a session.
	const sql = postgres(url, { max: 1, onnotice: () => {}, connect_timeout: 5 });
	try {
		await sql`select pg_advisory_lock(${MIGRATION_LOCK})`;
		await migrate(drizzle(sql), { migrationsFolder: folder });
		// Imported here so the schema module stays small.
		const { fillAfterMigrations } = await import('../part-models');
		return await drizzle(sql, { schema }).transaction((tx) => fillAfterMigrations(tx));
	} finally {
		// Closing the session releases the lock.
		await sql.end({ timeout: 5 });
	}
}
