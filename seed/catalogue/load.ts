// Loads the demo catalogue through the same domain functions a librarian's screens and the
// API use (catalogue.create, catalogue.addSample, runs.ingest). Skips whatever exists.
import { readFileSync } from 'node:fs';
import { and, eq } from 'drizzle-orm';
import { DEMO_PARTS } from './parts';
import type { ManifestEntry } from './generate';

const DIR = new URL('./files/', import.meta.url).pathname;

export async function loadDemoCatalogue(actor: { id: string } | null): Promise<{ parts: number; runs: number; skipped: number }> {
	const { db } = await import('../../src/lib/server/db');
	const { parts, samples, runs: runTable } = await import('../../src/lib/server/db/schema');
	const catalogue = await import('../../src/lib/server/catalogue');
	const runs = await import('../../src/lib/server/runs');
	const { readModelCard } = await import('../../src/lib/catalogue/model-card');
	const { partInput } = await import('../../src/lib/schemas/catalogue');
	const { createHash } = await import('node:crypto');

	const manifest = JSON.parse(readFileSync(DIR + 'manifest.json', 'utf8')) as ManifestEntry[];
	const known = new Set((await db.select({ sha: runTable.fileSha256 }).from(runTable)).map((r) => r.sha));
	let newParts = 0;
	let newRuns = 0;
	let skipped = 0;
	for (const d of DEMO_PARTS) {
		let [part] = await db.select().from(parts).where(and(eq(parts.maker, d.maker), eq(parts.partNumber, d.partNumber)));
		if (!part) {
			let model;
			if (d.card) {
				const c = readModelCard(d.card);
				if (!c.ok) throw new Error(`demo card of ${d.partNumber}: ${c.message}`);
				model = c.model;
			}
			const input = partInput.parse({
				partNumber: d.partNumber,
				maker: d.maker,
				kind: d.kind,
				package: d.package,
				material: d.material,
				admitsLight: d.admitsLight,
				anodePins: d.anodePins,
				cathodePins: d.cathodePins,
				ratings: d.ratings,
				tags: d.tags,
				notes: d.notes ?? '',
				lifecycle: d.lifecycle ?? 'in-use',
				model,
				modelSource: d.card ? `maker's SPICE card (${d.card.split(/\s+/)[1]})` : undefined
			});
			part = await catalogue.create(actor, input);
			newParts++;
		}
		for (const e of manifest.filter((m) => m.part === d.key)) {
			const bytes = readFileSync(DIR + e.file);
			if (known.has(createHash('sha256').update(bytes).digest('hex'))) {
				skipped++;
				continue;
			}
			const [s] = await db.select().from(samples).where(and(eq(samples.partId, part.id), eq(samples.unit, e.sample)));
			if (!s) await catalogue.addSample(actor, part.id, { unit: e.sample, lot: e.lot, dateCode: e.dateCode });
			const cv = 'measurement' in e ? { measurement: e.measurement, strayCapacitanceF: e.strayCapacitanceF, frequencyHz: e.frequencyHz, testLevelV: e.testLevelV } : {};
			await runs.ingest(actor, { partId: part.id, sample: e.sample, temperatureC: e.temperatureC, source: { kind: 'file', fileName: e.file, bytes }, ...cv });
			newRuns++;
		}
	}
	return { parts: newParts, runs: newRuns, skipped };
}
