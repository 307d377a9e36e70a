// Grows the catalogue to a given number of parts for load tests and benchmarks:
//   npx tsx seed/scale.ts 10000
// Parts are invented (seed/scale-parts.ts) and go in through the catalogue's own create path. Existing scale parts are kept, so it can be re-run.
import { count, eq } from 'drizzle-orm';
import { gaussian, mulberry32 } from '../src/lib/random';
import { SCALE_MAKER, scalePart } from './scale-parts';

const target = Number(process.argv[2] ?? 10_000);
const catalogue = await import('../src/lib/server/catalogue');
const { db, client } = await import('../src/lib/server/db');
const { parts } = await import('../src/lib/server/db/schema');
const people = await import('../src/lib/server/people');

try {
	const librarian = await people.findByEmail('librarian@demo.test');
	const [{ n }] = await db.select({ n: count() }).from(parts);
	const [{ mine }] = await db.select({ mine: count() }).from(parts).where(eq(parts.maker, SCALE_MAKER));
	const rand = mulberry32(4242 + mine);
	const normal = gaussian(rand);
	const todo = Math.max(0, target - n);
	const started = Date.now();
	let made = 0;
	const next = async (): Promise<void> => {
		while (made < todo) {
			const i = mine + made++;
			await catalogue.create(librarian ? { id: librarian.id } : null, scalePart(i, rand, normal));
		}
	};
	await Promise.all(Array.from({ length: 6 }, next));
	console.log(`\x1b[2m[junctionary]\x1b[0m catalogue scaled to ${n + todo} parts (${todo} added in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
} finally {
	await client.end();
}
