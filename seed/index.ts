// Loads the demo scenario through the application's own code paths. Safe to run twice.
import { DEMO_PEOPLE } from './people';

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
