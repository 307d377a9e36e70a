// Grows the catalogue to a given number of parts for load tests and benchmarks:
//   npx tsx seed/scale.ts 10000
// Parts are invented ("LX-" numbers from the invented maker Tallowmere Devices), each with a
// model given directly and scattered around physically sensible values, and go in through
// the catalogue's own create path. Existing scale parts are kept, so it can be re-run.
import { count, eq } from 'drizzle-orm';
import { gaussian, mulberry32 } from '../src/lib/random';

const target = Number(process.argv[2] ?? 10_000);
const catalogue = await import('../src/lib/server/catalogue');
const { db, client } = await import('../src/lib/server/db');
const { parts } = await import('../src/lib/server/db/schema');
const people = await import('../src/lib/server/people');

const MAKER = 'Tallowmere Devices';
const KINDS = ['diode', 'schottky', 'bjt-be', 'bjt-diode', 'jfet-gate', 'led'] as const;
// Typical centre values per kind: IS [A], N, RS [Ω], rated reverse voltage [V].
const CENTRE: Record<(typeof KINDS)[number], { IS: number; N: number; RS: number; VR: number; EG?: number; XTI?: number }> = {
	diode: { IS: 3e-12, N: 1.8, RS: 0.8, VR: 75 },
	schottky: { IS: 2e-8, N: 1.05, RS: 3, VR: 30 },
	'bjt-be': { IS: 2e-14, N: 1.0, RS: 8, VR: 6 },
	'bjt-diode': { IS: 1e-14, N: 1.0, RS: 4, VR: 6 },
	'jfet-gate': { IS: 5e-15, N: 1.3, RS: 20, VR: 30 },
	led: { IS: 1e-20, N: 2.0, RS: 6, VR: 5, EG: 2.0, XTI: 3 }
};

try {
	const librarian = await people.findByEmail('librarian@demo.test');
	const [{ n }] = await db.select({ n: count() }).from(parts);
	const [{ mine }] = await db.select({ mine: count() }).from(parts).where(eq(parts.maker, MAKER));
	const rand = mulberry32(4242 + mine);
	const normal = gaussian(rand);
	const todo = Math.max(0, target - n);
	const started = Date.now();
	let made = 0;
	const next = async (): Promise<void> => {
		while (made < todo) {
			const i = mine + made++;
			const kind = KINDS[i % KINDS.length];
			const c = CENTRE[kind];
			await catalogue.create(librarian ? { id: librarian.id } : null, {
				partNumber: `LX-${String(i + 1).padStart(5, '0')}${kind === 'led' ? 'L' : ''}`,
				maker: MAKER,
				kind,
				package: ['SOD-323', 'SOT-23', 'DO-35 glass', 'TO-92', '0603 clear'][i % 5],
				anodePins: '1',
				cathodePins: '2',
				ratings: { reverseV: c.VR * (1 + 0.5 * rand()) },
				tags: ['scale-test'],
				notes: '',
				lifecycle: i % 17 === 0 ? 'not-for-new' : 'in-use',
				model: {
					IS: c.IS * Math.exp(1.2 * normal()),
					N: Math.min(2.2, Math.max(1, c.N * (1 + 0.04 * normal()))),
					RS: c.RS * Math.exp(0.3 * normal()),
					RSH: rand() < 0.5 ? 10 ** (9 + 4 * rand()) : undefined,
					...(c.EG ? { EG: c.EG, XTI: c.XTI } : {})
				},
				modelSource: 'scale test (invented)'
			});
		}
	};
	await Promise.all(Array.from({ length: 6 }, next));
	console.log(`\x1b[2m[junctionary]\x1b[0m catalogue scaled to ${n + todo} parts (${todo} added in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
} finally {
	await client.end();
}
