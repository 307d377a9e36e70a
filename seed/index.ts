// Loads the demo scenario through the application's own code paths. Safe to run twice.
// Never on a team installation (SMTP_URL set): its people would be real sign-in addresses.
import { isDemo } from '../src/lib/server/deployment';
import { DEMO_PEOPLE } from './people';

if (!isDemo()) {
	console.error('SMTP_URL is set, so this is a team installation: the demo people and catalogue are not loaded into it.');
	process.exit(1);
}

const people = await import('../src/lib/server/people');
const { client } = await import('../src/lib/server/db');

try {
	for (const p of DEMO_PEOPLE) {
		if (!(await people.findByEmail(p.email))) await people.upsert(p, null);
	}
	console.log(`\x1b[2m[junctionary]\x1b[0m demo people ready (${DEMO_PEOPLE.map((p) => p.email).join(', ')})`);
	const { loadDemoCatalogue } = await import('./catalogue/load');
	const librarian = await people.findByEmail('librarian@demo.test');
	const started = Date.now();
	const loaded = await loadDemoCatalogue(librarian ? { id: librarian.id } : null);
	console.log(
		`\x1b[2m[junctionary]\x1b[0m demo catalogue ready (${loaded.parts} parts and ${loaded.runs} runs added, ${loaded.skipped} runs already there; ${((Date.now() - started) / 1000).toFixed(1)} s)`
	);
} finally {
	await client.end();
}
