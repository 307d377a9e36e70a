/**
 * Which database a command-line tool should use, looked for where `npm start` gets its
 * own: the environment, then the checkout's .env, then the record a running `npm start`
 * leaves in .data/start.json, then npm start's own cluster on its default port.
 */
type Env = Record<string, string | undefined>;

/** scripts/start.sh's default port for the project's own PostgreSQL cluster. */
export const START_PGPORT = 54329;

export type RunningStart = { url?: string; databaseUrl?: string };

export function locateDatabase(input: { env: Env; envFile: Env | null; running: RunningStart | null }): { url: string; from: string } {
	const { env, envFile, running } = input;
	if (env.DATABASE_URL) return { url: env.DATABASE_URL, from: 'DATABASE_URL in the environment' };
	if (envFile?.DATABASE_URL) return { url: envFile.DATABASE_URL, from: 'DATABASE_URL in .env' };
	if (running?.databaseUrl) return { url: running.databaseUrl, from: `the npm start running at ${running.url ?? 'this checkout'}` };
	const port = env.PGPORT ?? envFile?.PGPORT ?? String(START_PGPORT);
	return { url: `postgres://junctionary@127.0.0.1:${port}/junctionary`, from: `npm start's own cluster (PGPORT ${port})` };
}

/** The URL with any password replaced, fit to print. */
export function printableUrl(url: string): string {
	return url.replace(/^([a-z]+:\/\/[^:@/]*):[^@/]*@/i, '$1:…@');
}
