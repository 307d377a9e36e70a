// Importing a parts list: a preview (every row as it will be stored, updates as diffs, every
// problem at its row and column) that writes nothing, and a confirm that writes the whole
// list in one transaction with one audit row, or nothing at all.
import { createHash } from 'node:crypto';
import { eq, inArray, sql } from 'drizzle-orm';
import { DEFAULT_MATERIAL } from '$lib/catalogue/vocabulary';
import { PART_COLUMNS, readPartsList, type Field, type Problem, type Table } from '$lib/catalogue/parts-list';
import type { ImportPreview, ImportRow, PartValues } from '$lib/catalogue/import-preview';
import type { PartInput, PartPatch } from '$lib/schemas/catalogue';
import { DomainError } from './errors';
import { recordAudit } from './audit';
import { rowFromInput, uniqueViolation, type Part } from './catalogue';
import { db, type DbOrTx } from './db';
import { parts } from './db/schema';
import { rebuildPartModel } from './part-models';

type Actor = { id: string } | null;

/** A part's importable fields in the shape of a list row (tags as stored: lower case, once each). */
function valuesOfPart(p: Part): PartValues {
	return {
		partNumber: p.partNumber,
		maker: p.maker,
		kind: p.kind,
		package: p.package,
		material: p.material,
		admitsLight: p.admitsLight,
		anodePins: p.anodePins,
		cathodePins: p.cathodePins,
		reverseV: p.ratedReverseV,
		forwardA: p.ratedForwardA,
		junctionC: p.ratedJunctionC,
		tags: p.tags,
		lifecycle: p.lifecycle,
		notes: p.notes
	};
}

/** The values a new part gets from its row, defaults included, as catalogue.create stores them. */
function valuesOfInput(input: PartInput): PartValues {
	return {
		partNumber: input.partNumber,
		maker: input.maker,
		kind: input.kind,
		package: input.package,
		material: input.material ?? DEFAULT_MATERIAL[input.kind],
		admitsLight: input.admitsLight ?? input.kind === 'led',
		anodePins: input.anodePins,
		cathodePins: input.cathodePins,
		reverseV: input.ratings.reverseV ?? null,
		forwardA: input.ratings.forwardA ?? null,
		junctionC: input.ratings.junctionC ?? null,
		tags: [...new Set(input.tags.map((t) => t.toLowerCase()))],
		lifecycle: input.lifecycle,
		notes: input.notes
	};
}

const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);
const matchKey = (maker: string, partNumber: string) => `${maker.trim().toLowerCase()}\u0000${partNumber}`;

async function existingParts(tx: DbOrTx, inputs: PartInput[]): Promise<Map<string, Part>> {
	const numbers = [...new Set(inputs.map((i) => i.partNumber))];
	const found = new Map<string, Part>();
	for (let k = 0; k < numbers.length; k += 500) {
		const rows = await tx.select().from(parts).where(inArray(parts.partNumber, numbers.slice(k, k + 500)));
		for (const p of rows) found.set(matchKey(p.maker, p.partNumber), p);
	}
	return found;
}

/** What a table would do to the catalogue; nothing is written. */
export async function previewTable(table: Table, tx: DbOrTx = db): Promise<ImportPreview> {
	const list = readPartsList(table);
	const existing = await existingParts(tx, list.rows.flatMap((r) => (r.input ? [r.input] : [])));
	const rows: ImportRow[] = list.rows.map((r) => {
		if (!r.input) return { row: r.row, action: 'invalid', id: null, values: null, changes: [], problems: r.problems };
		const now = valuesOfInput(r.input);
		const part = existing.get(matchKey(r.input.maker, r.input.partNumber));
		if (!part) return { row: r.row, action: 'create', id: null, values: now, changes: [], problems: [] };
		const before = valuesOfPart(part);
		const after: PartValues = { ...before };
		for (const f of r.given) if (f !== 'partNumber' && f !== 'maker') (after as Record<Field, unknown>)[f] = now[f];
		const changes = PART_COLUMNS.filter((c) => !same(before[c.field], after[c.field])).map((c) => ({ field: c.field, label: c.label, from: before[c.field], to: after[c.field] }));
		return { row: r.row, action: changes.length ? 'update' : 'unchanged', id: part.id, values: after, changes, problems: [] };
	});
	const count = (a: ImportRow['action']) => rows.filter((r) => r.action === a).length;
	const plan = rows.map((r) => [r.row, r.action, r.id, r.values, r.changes]);
	return {
		counts: { rows: rows.length, create: count('create'), update: count('update'), unchanged: count('unchanged'), invalid: count('invalid') },
		columns: list.columns,
		ignored: list.ignored,
		problems: list.problems,
		rows,
		fingerprint: createHash('sha256').update(JSON.stringify(plan)).digest('hex').slice(0, 32)
	};
}

function refuseProblems(problems: Problem[]): never {
	const shown = problems.slice(0, 200).map((p) => ({ row: p.row, column: p.column, message: p.message }));
	throw new DomainError(
		422,
		`The list has ${problems.length} problem${problems.length === 1 ? '' : 's'} (first: row ${problems[0].row}, ${problems[0].column}: ${problems[0].message}). Nothing was imported.`,
		shown
	);
}

function patchOf(values: PartValues): PartPatch {
	return {
		kind: values.kind,
		package: values.package,
		material: values.material,
		admitsLight: values.admitsLight,
		anodePins: values.anodePins,
		cathodePins: values.cathodePins,
		ratings: { reverseV: values.reverseV ?? undefined, forwardA: values.forwardA ?? undefined, junctionC: values.junctionC ?? undefined },
		tags: values.tags,
		lifecycle: values.lifecycle,
		notes: values.notes
	} as PartPatch;
}

/** Fields whose change reaches the part's predictions (flags, temperature defaults, ratings). */
const MODEL_FIELDS: Field[] = ['kind', 'material', 'admitsLight', 'reverseV', 'forwardA', 'junctionC'];

export type ImportOutcome = { id: number; created: number[]; updated: number[]; unchanged: number; preview: ImportPreview };

/**
 * Writes the list: every new part and every change, in one transaction with one audit row.
 * A list with any problem, or one whose preview (fingerprint) no longer matches, writes nothing.
 * @throws DomainError 422 (problems, with row and column), 409 (catalogue changed since the preview).
 */
export async function importTable(actor: Actor, table: Table, fingerprint?: string): Promise<ImportOutcome> {
	try {
		return await db.transaction(async (tx) => {
			// One import at a time: two lists naming one new part must not both try to create it.
			await tx.execute(sql`select pg_advisory_xact_lock(hashtext('parts-import'))`);
			const preview = await previewTable(table, tx);
			if (preview.problems.length) refuseProblems(preview.problems);
			if (fingerprint && fingerprint !== preview.fingerprint)
				throw new DomainError(409, 'The catalogue changed since this preview was made; look at the new preview and confirm again. Nothing was imported.');
			const created: number[] = [];
			const updated: number[] = [];
			for (const r of preview.rows) {
				if (r.action === 'create') {
					const v = r.values!;
					const [p] = await tx
						.insert(parts)
						.values({ ...(rowFromInput(patchOf(v), undefined) as typeof parts.$inferInsert), partNumber: v.partNumber, maker: v.maker, createdBy: actor?.id ?? null })
						.returning({ id: parts.id });
					created.push(p.id);
				} else if (r.action === 'update') {
					await tx.update(parts).set(rowFromInput(patchOf(r.values!), undefined)).where(eq(parts.id, r.id!));
					if (r.changes.some((c) => MODEL_FIELDS.includes(c.field))) await rebuildPartModel(tx, r.id!);
					updated.push(r.id!);
				}
			}
			const audit = await recordAudit(tx, {
				actorId: actor?.id ?? null,
				action: 'parts.import',
				entity: 'parts-list',
				entityId: preview.fingerprint,
				detail: { rows: preview.counts.rows, created, updated, unchanged: preview.counts.unchanged, changes: preview.rows.filter((r) => r.action === 'update').map((r) => ({ id: r.id, fields: r.changes.map((c) => c.field) })) }
			});
			return { id: audit.id, created, updated, unchanged: preview.counts.unchanged, preview };
		});
	} catch (e) {
		if (uniqueViolation(e)) throw new DomainError(409, 'A part in the list was added by someone else meanwhile; preview the list again. Nothing was imported.');
		throw e;
	}
}
