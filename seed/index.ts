// Loads the demo scenario through the application's own code paths. Safe to run twice.
import { DEMO_PEOPLE } from './people';

const people = await import('../src/lib/server/people');
const { client } = await import('../src/lib/server/db');

try {
	for (const p of DEMO_PEOPLE) {
		if (!(await people.findByEmail(p.email))) await people.upsert(p, null);
	}
	console.log(`\x1b[2m[junctionary]\x1b[0m demo people ready (${DEMO_PEOPLE.map((p) => p.email).join(', ')})`);
} finally {
	await client.end();
}
