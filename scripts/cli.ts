// npm run cli -- token create --email <address> [--name <name>] [--days <n>]
// npm run cli -- admin grant --email <address> [--name <name>]
//
// Uses the database npm start uses: DATABASE_URL from the environment or .env, else the
// running npm start's (its .data/start.json), else npm start's own cluster.
import { existsSync, readFileSync } from 'node:fs';
import { parseArgs, parseEnv } from 'node:util';
import { fileURLToPath } from 'node:url';
import { locateDatabase, printableUrl, type RunningStart } from '../src/lib/server/db/locate';

const { positionals, values } = parseArgs({
	allowPositionals: true,
	options: { email: { type: 'string' }, name: { type: 'string' }, days: { type: 'string' } }
});
const [noun, verb] = positionals;

const usage = `usage:
  npm run cli -- token create --email <address> [--name <label>] [--days <n>]
                                        print a new API token that works for n days (default 90, at most 366)
  npm run cli -- admin grant --email <address> [--name <name>]     make that person an admin`;

const root = fileURLToPath(new URL('..', import.meta.url));
function readIfThere(path: string): string | null {
	return existsSync(path) ? readFileSync(path, 'utf8') : null;
}

const envText = readIfThere(`${root}.env`);
const envFile = envText === null ? null : (parseEnv(envText) as Record<string, string>);
// The same .env npm start reads, never overriding what the shell set.
for (const [k, v] of Object.entries(envFile ?? {})) process.env[k] ??= v;
let running: RunningStart | null = null;
try {
	running = JSON.parse(readIfThere(`${root}.data/start.json`) ?? 'null');
} catch {
	running = null;
}
const database = locateDatabase({ env: process.env, envFile, running });
process.env.DATABASE_URL = database.url;

function cannotReach(reason: string): string {
	return [
		`Could not use the database at ${printableUrl(database.url)} (${database.from}): ${reason}`,
		'Either start Junctionary with `npm start` (in another terminal) so its database is running, or set',
		'DATABASE_URL — in the environment or in .env — to your installation’s database, for example',
		'  DATABASE_URL=postgres://junctionary@db.example:5432/junctionary npm run cli -- token create --email you@example.com'
	].join('\n');
}

async function main() {
	const people = await import('../src/lib/server/people');
	const tokens = await import('../src/lib/server/tokens');
	const { isDatabaseDown } = await import('../src/lib/server/api');
	const { TOKEN_DEFAULT_DAYS, TOKEN_MAX_DAYS } = await import('../src/lib/schemas/people');
	const { client } = await import('../src/lib/server/db');
	try {
		if (!values.email) throw new Error('--email is required\n' + usage);
		if (noun === 'token' && verb === 'create') {
			const person = await people.findByEmail(values.email);
			if (!person) throw new Error(`no person with e-mail ${values.email} in ${printableUrl(database.url)} (${database.from})`);
			if (!people.maySignIn(person)) throw new Error(`${values.email} is deactivated; an admin can reactivate them on the People page`);
			const days = Number(values.days ?? TOKEN_DEFAULT_DAYS);
			if (!Number.isInteger(days) || days < 1 || days > TOKEN_MAX_DAYS) throw new Error(`--days is a whole number of days from 1 to ${TOKEN_MAX_DAYS}`);
			const created = await tokens.create(person.id, values.name ?? 'command line', null, new Date(Date.now() + days * 86_400_000));
			console.log(created.token);
		} else if (noun === 'admin' && verb === 'grant') {
			const person = await people.upsert({ email: values.email, name: values.name ?? values.email, roles: ['admin'] }, null);
			console.log(`${person.email} now holds: ${person.roles.join(', ')}`);
		} else {
			throw new Error(usage);
		}
	} catch (e) {
		// Not running, wrong database name, refused credentials, or no tables yet.
		const code = (e as { code?: string; cause?: { code?: string } }).cause?.code ?? (e as { code?: string }).code ?? '';
		if (isDatabaseDown(e) || ['3D000', '28000', '28P01', '42P01'].includes(code)) {
			const cause = (e as { cause?: Error }).cause ?? (e as Error);
			throw new Error(cannotReach(cause.message));
		}
		throw e;
	} finally {
		await client.end({ timeout: 2 });
	}
}

main().catch((e: Error) => {
	console.error(e.message);
	process.exit(1);
});
