// npm run cli -- token create --email <address> [--name <name>]
// npm run cli -- admin grant --email <address> [--name <name>]
import { parseArgs } from 'node:util';

const { positionals, values } = parseArgs({
	allowPositionals: true,
	options: { email: { type: 'string' }, name: { type: 'string' } }
});
const [noun, verb] = positionals;

const usage = `usage:
  npm run cli -- token create --email <address> [--name <label>]   print a new API token
  npm run cli -- admin grant --email <address> [--name <name>]     make that person an admin`;

async function main() {
	const people = await import('../src/lib/server/people');
	const tokens = await import('../src/lib/server/tokens');
	const { client } = await import('../src/lib/server/db');
	try {
		if (!values.email) throw new Error('--email is required\n' + usage);
		if (noun === 'token' && verb === 'create') {
			const person = await people.findByEmail(values.email);
			if (!person) throw new Error(`no person with e-mail ${values.email}`);
			const created = await tokens.create(person.id, values.name ?? 'command line', null);
			console.log(created.token);
		} else if (noun === 'admin' && verb === 'grant') {
			const person = await people.upsert({ email: values.email, name: values.name ?? values.email, roles: ['admin'] }, null);
			console.log(`${person.email} now holds: ${person.roles.join(', ')}`);
		} else {
			throw new Error(usage);
		}
	} finally {
		await client.end();
	}
}

main().catch((e: Error) => {
	console.error(e.message);
	process.exit(1);
});
