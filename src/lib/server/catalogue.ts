// The parts catalogue: creating and changing parts, samples and given models; listings.
import { and, asc, desc, eq, gt, ilike, isNull, or, sql, type SQL } from 'drizzle-orm';
import { partNames } from '$lib/catalogue/part-names';
import { readModelCard } from '$lib/catalogue/model-card';
import { DEFAULT_MATERIAL, type JunctionKind, type Material } from '$lib/catalogue/vocabulary';
import { partFlags, toEngine } from '$lib/catalogue/models';
import type { PartInput, PartPatch } from '$lib/schemas/catalogue';
import { DomainError } from './errors';
import type { CompactPart } from '$lib/catalogue/compact-part';
import { recordAudit } from './audit';
import { db, type DbOrTx } from './db';
import { fits, partCapacitance, partModels, parts, runs, samples, type StoredModel } from './db/schema';
import { rebuildPartModel } from './part-models';

type Actor = { id: string } | null;
export type Part = typeof parts.$inferSelect;
export type PartModelRow = typeof partModels.$inferSelect;
export type PartCapacitanceRow = typeof partCapacitance.$inferSelect;

/** A given model must be one the engine accepts; its complaint names the parameter. */
function checkModel(model: StoredModel, material: Material, path = 'model'): void {
	try {
		toEngine(model, material);
	} catch (e) {
		throw new DomainError(400, `The model is not valid: ${(e as Error).message}.`, [{ path, message: (e as Error).message }]);
	}
}

/** PostgreSQL's unique_violation, whether thrown directly or wrapped by Drizzle (as `cause`). */
export function uniqueViolation(e: unknown, constraint?: string): boolean {
	for (let x = e as { code?: string; constraint_name?: string; cause?: unknown } | undefined; x; x = x.cause as typeof x) {
		if (x.code === '23505') return constraint ? String(x.constraint_name ?? '').includes(constraint) : true;
	}
	return false;
}

function duplicatePart(maker: string, partNumber: string) {
	return new DomainError(409, `${maker} ${partNumber} is already in the catalogue.`, [{ path: 'partNumber', message: 'this maker already has this part number' }]);
}

/** The parts columns a create or patch sets (tags lower-cased, once each). */
export function rowFromInput(input: PartInput | PartPatch, kind: JunctionKind | undefined): Partial<typeof parts.$inferInsert> {
	const out: Partial<typeof parts.$inferInsert> = {};
	if (input.partNumber !== undefined) out.partNumber = input.partNumber;
	if (input.maker !== undefined) out.maker = input.maker;
	if (input.kind !== undefined) out.kind = input.kind;
	if (input.package !== undefined) out.package = input.package;
	if (input.material !== undefined) out.material = input.material;
	else if ('kind' in input && input.kind && kind) out.material = DEFAULT_MATERIAL[kind];
	if (input.admitsLight !== undefined) out.admitsLight = input.admitsLight;
	if (input.anodePins !== undefined) out.anodePins = input.anodePins;
	if (input.cathodePins !== undefined) out.cathodePins = input.cathodePins;
	if (input.ratings !== undefined) {
		out.ratedReverseV = input.ratings.reverseV ?? null;
		out.ratedForwardA = input.ratings.forwardA ?? null;
		out.ratedJunctionC = input.ratings.junctionC ?? null;
	}
	if (input.tags !== undefined) out.tags = [...new Set(input.tags.map((t) => t.toLowerCase()))];
	if (input.notes !== undefined) out.notes = input.notes;
	if (input.lifecycle !== undefined) out.lifecycle = input.lifecycle;
	return out;
}

export async function create(actor: Actor, input: PartInput): Promise<Part> {
	const material = input.material ?? DEFAULT_MATERIAL[input.kind];
	if (input.model) checkModel(input.model, material);
	try {
		return await db.transaction(async (tx) => {
			const [part] = await tx
				.insert(parts)
				.values({
					...(rowFromInput(input, input.kind) as typeof parts.$inferInsert),
					material,
					admitsLight: input.admitsLight ?? input.kind === 'led',
					givenModel: input.model ?? null,
					givenModelSource: input.model ? (input.modelSource ?? 'given with the part') : null,
					createdBy: actor?.id ?? null
				})
				.returning();
			if (input.model) await rebuildPartModel(tx, part.id);
			await recordAudit(tx, { actorId: actor?.id ?? null, action: 'part.create', entity: 'part', entityId: part.id, detail: { partNumber: part.partNumber, maker: part.maker, givenModel: Boolean(input.model) } });
			const [fresh] = await tx.select().from(parts).where(eq(parts.id, part.id));
			return fresh;
		});
	} catch (e) {
		if (uniqueViolation(e)) throw duplicatePart(input.maker, input.partNumber);
		throw e;
	}
}

export async function update(actor: Actor, id: number, patch: PartPatch): Promise<Part> {
	const existing = await get(id);
	if (!existing) throw new DomainError(404, `No part ${id}.`);
	const material = patch.material ?? existing.material;
	if (patch.model) checkModel(patch.model, material as Material);
	try {
		return await db.transaction(async (tx) => {
			const set = rowFromInput(patch, undefined);
			const modelChanged = patch.model !== undefined || patch.material !== undefined || patch.kind !== undefined || patch.admitsLight !== undefined || patch.ratings !== undefined;
			if (patch.model !== undefined) {
				set.givenModel = patch.model;
				set.givenModelSource = patch.model ? (patch.modelSource ?? 'given by a librarian') : null;
			} else if (patch.modelSource !== undefined) set.givenModelSource = patch.modelSource;
			if (Object.keys(set).length) await tx.update(parts).set(set).where(eq(parts.id, id));
			if (modelChanged) await rebuildPartModel(tx, id);
			await recordAudit(tx, { actorId: actor?.id ?? null, action: 'part.update', entity: 'part', entityId: id, detail: { fields: Object.keys(patch) } });
			const [fresh] = await tx.select().from(parts).where(eq(parts.id, id));
			return fresh;
		});
	} catch (e) {
		if (uniqueViolation(e)) throw duplicatePart(patch.maker ?? existing.maker, patch.partNumber ?? existing.partNumber);
		throw e;
	}
}

/** Reads a SPICE `.model` card (readModelCard, as the forms' preview does) and keeps it as the part's given model, with its source. */
export async function importModelCard(actor: Actor, id: number, cardText: string, source: string) {
	const part = await get(id);
	if (!part) throw new DomainError(404, `No part ${id}.`);
	const card = cardModel(cardText, part.material as Material);
	const src = source.trim() || `.model ${card.name}`;
	await db.transaction(async (tx) => {
		await tx.update(parts).set({ givenModel: card.model, givenModelSource: src }).where(eq(parts.id, id));
		await rebuildPartModel(tx, id);
		await recordAudit(tx, { actorId: actor?.id ?? null, action: 'part.model-card', entity: 'part', entityId: id, detail: { name: card.name, source: src, warnings: card.warnings } });
	});
	return { name: card.name, model: card.model, warnings: card.warnings };
}

/** A card's model, checked by the engine for this material. @throws DomainError 400 naming the card. */
export function cardModel(cardText: string, material: Material) {
	const card = readModelCard(cardText);
	if (!card.ok) throw new DomainError(400, `The card cannot be read: ${card.message}.`, [{ path: 'card', message: card.message }]);
	checkModel(card.model, material, 'card');
	return card;
}

export async function addSample(actor: Actor, partId: number, input: { unit: string; lot: string; dateCode: string }) {
	const part = await get(partId);
	if (!part) throw new DomainError(404, `No part ${partId}.`);
	try {
		return await db.transaction(async (tx) => {
			const [s] = await tx.insert(samples).values({ partId, ...input }).returning();
			await recordAudit(tx, { actorId: actor?.id ?? null, action: 'sample.create', entity: 'sample', entityId: s.id, detail: { partId, unit: input.unit } });
			return s;
		});
	} catch (e) {
		if (uniqueViolation(e)) throw new DomainError(409, `This part already has a sample labelled ${input.unit}.`, [{ path: 'unit', message: 'label already used for this part' }]);
		throw e;
	}
}

export async function get(id: number, tx: DbOrTx = db): Promise<Part | null> {
	const [p] = await tx.select().from(parts).where(eq(parts.id, id));
	return p ?? null;
}

/**
 * The part page's reads, built and prepared once (the part page is among the most requested
 * addresses): the part with its model and capacitance in one row, its samples, its runs.
 */
const partWithModels = db
	.select({ part: parts, model: partModels, capacitance: partCapacitance })
	.from(parts)
	.leftJoin(partModels, eq(partModels.partId, parts.id))
	.leftJoin(partCapacitance, eq(partCapacitance.partId, parts.id))
	.where(eq(parts.id, sql.placeholder('id')))
	.prepare('catalogue_part_with_models');

const samplesOfPart = db.select().from(samples).where(eq(samples.partId, sql.placeholder('id'))).orderBy(asc(samples.unit)).prepare('catalogue_samples_of_part');

/** A part's runs, each with its current fit (earlier fit versions are on the run's own page). */
const runsOfPart = db
	.select({
		id: runs.id,
		sampleId: runs.sampleId,
		measurement: runs.measurement,
		temperatureC: runs.temperatureC,
		direction: runs.direction,
		frequencyHz: runs.frequencyHz,
		testLevelV: runs.testLevelV,
		fileName: runs.fileName,
		sha256: runs.fileSha256,
		points: runs.points,
		createdAt: runs.createdAt,
		state: runs.state,
		withdrawnAt: runs.withdrawnAt,
		withdrawnReason: runs.withdrawnReason,
		fit: {
			version: fits.version,
			model: fits.model,
			interval: fits.interval,
			quality: fits.quality,
			range: fits.range,
			excludedV: fits.excludedV,
			strayCapacitanceF: fits.strayCapacitanceF
		}
	})
	.from(runs)
	.leftJoin(fits, and(eq(fits.runId, runs.id), isNull(fits.supersededAt)))
	.where(eq(runs.partId, sql.placeholder('id')))
	.orderBy(asc(runs.id))
	.prepare('catalogue_runs_of_part');

/** Everything the part page and GET /api/v1/junctions/{id} show. */
export async function detail(id: number) {
	// Independent reads, sent together: one wait on the pool instead of one per read.
	const [[row], sampleRows, runRows] = await Promise.all([partWithModels.execute({ id }), samplesOfPart.execute({ id }), runsOfPart.execute({ id })]);
	if (!row) return null;
	return { part: row.part, model: row.model, capacitance: row.capacitance, samples: sampleRows, runs: runRows.map(runFit) };
}

type RunRow = { measurement: string; fit: { strayCapacitanceF: number | null } | null };

/** A run's current fit as shown: the stray capacitance only on C–V fits. */
function runFit<R extends RunRow>(r: R): R {
	if (r.measurement === 'cv' || !r.fit) return r;
	const { strayCapacitanceF: _, ...fit } = r.fit;
	return { ...r, fit: fit as R['fit'] };
}

/** A part's detail; a missing part is a DomainError 404 (pages turn it into their error page with pageError). */
export async function detailOr404(id: number) {
	const d = await detail(id);
	if (!d) throw new DomainError(404, `No part ${id} in the catalogue.`);
	return d;
}

/** The part's capacitance as the API shows it: where it comes from, typical CJO/VJ/M/FC at TNOM, spread, samples. */
function presentCapacitance(c: PartCapacitanceRow | null) {
	if (!c) return null;
	return { source: c.source, typical: c.typical, spread: c.spread, sampleCount: c.samples.length, samples: c.samples.map(({ unit, runId, CJO, VJ, M, FC, temperatureC }) => ({ unit, runId, CJO, VJ, M, FC, temperatureC })) };
}

/** The API's representation of a part (SI units, °C). */
export function present(part: Part, model: PartModelRow | null, capacitance: PartCapacitanceRow | null = null) {
	return {
		...partNames(part),
		material: part.material,
		admitsLight: part.admitsLight,
		pins: { anode: part.anodePins, cathode: part.cathodePins },
		ratings: { reverseV: part.ratedReverseV, forwardA: part.ratedForwardA, junctionC: part.ratedJunctionC },
		tags: part.tags,
		lifecycle: part.lifecycle,
		notes: part.notes,
		givenModel: part.givenModel,
		givenModelSource: part.givenModelSource,
		modelVersion: part.modelVersion,
		createdAt: part.createdAt,
		updatedAt: part.updatedAt,
		model: model
			? {
								typical: model.typical,
								worst: model.worst,
								sampleModels: model.sampleModels,
								spread: model.spread,
								measured: model.measured,
								sampleCount: model.sampleCount,
								isMeasured: model.isMeasured,
				version: model.version
			}
			: null,
		capacitance: presentCapacitance(capacitance),
		flags: partFlags({
			kind: part.kind,
			material: part.material,
			admitsLight: part.admitsLight,
			isMeasured: model?.isMeasured ?? false,
			hasModel: Boolean(model),
			sampleCount: model?.sampleCount ?? 0,
			reverseMeasured: model?.measured.reverseMeasured ?? false,
			capacitanceSource: capacitance?.source ?? null
		})
	};
}

/** The listing's query for one combination of filters, built and prepared once (values are placeholders). */
function listingQuery(shape: { cursor: boolean; kind: boolean; q: boolean; qHoldsSeparator: boolean }) {
	const where: SQL[] = [];
	if (shape.cursor) where.push(gt(parts.id, sql.placeholder('cursor')));
	if (shape.kind) where.push(eq(parts.kind, sql.placeholder('kind')));
	if (shape.q) {
		const like = sql.placeholder('like');
		// Tags are matched in one string joined by the unit separator (U+001F), the expression
		// of their trigram index (as part number and maker have theirs): the same matches unless
		// the text itself holds that character, which then goes tag by tag.
		const inTags = shape.qHoldsSeparator
			? sql`exists (select 1 from unnest(${parts.tags}) t where t ilike ${like})`
			: sql`parts_tags_text(${parts.tags}) ilike ${like}`;
		where.push(or(ilike(parts.partNumber, like), ilike(parts.maker, like), inTags) as SQL);
	}
	const name = `catalogue_list_${Number(shape.cursor)}${Number(shape.kind)}${Number(shape.q)}${Number(shape.qHoldsSeparator)}`;
	return db
		.select({ part: parts, model: partModels, capacitance: partCapacitance })
		.from(parts)
		.leftJoin(partModels, eq(partModels.partId, parts.id))
		.leftJoin(partCapacitance, eq(partCapacitance.partId, parts.id))
		.where(where.length ? and(...where) : undefined)
		.orderBy(asc(parts.id))
		.limit(sql.placeholder('limit'))
		.prepare(name);
}

const listingQueries = new Map<string, ReturnType<typeof listingQuery>>();

/** Paged listing for the API: id order, cursor = last id of the previous page. */
export async function list(opts: { q: string; kind?: JunctionKind; limit: number; cursor?: string }) {
	const shape = { cursor: !!opts.cursor, kind: !!opts.kind, q: !!opts.q, qHoldsSeparator: opts.q.includes('\u001f') };
	const key = JSON.stringify(shape);
	let query = listingQueries.get(key);
	if (!query) listingQueries.set(key, (query = listingQuery(shape)));
	const rows = await query.execute({
		cursor: opts.cursor ? Number(opts.cursor) : undefined,
		kind: opts.kind,
		like: `%${opts.q.replace(/[\\%_]/g, (c) => '\\' + c)}%`,
		limit: opts.limit + 1
	});
	const more = rows.length > opts.limit;
	const page = rows.slice(0, opts.limit);
	return { items: page.map((r) => present(r.part, r.model, r.capacitance)), nextCursor: more ? String(page[page.length - 1].part.id) : null };
}

/** Every part in a compact form, loaded once by the catalogue page for in-browser search. */
export async function compactList(): Promise<CompactPart[]> {
	const rows = await db
		.select({
			id: parts.id,
			pn: parts.partNumber,
			mk: parts.maker,
			kind: parts.kind,
			pkg: parts.package,
			mat: parts.material,
			life: parts.lifecycle,
			tags: parts.tags,
			typical: partModels.typical,
			sampleCount: partModels.sampleCount,
			isMeasured: partModels.isMeasured,
			vr: parts.ratedReverseV,
			updated: parts.updatedAt
		})
		.from(parts)
		.leftJoin(partModels, eq(partModels.partId, parts.id))
		.orderBy(desc(parts.updatedAt));
	return rows.map((r) => ({
		id: r.id,
		pn: r.pn,
		mk: r.mk,
		kind: r.kind,
		pkg: r.pkg,
		mat: r.mat,
		life: r.life,
		tags: r.tags,
		is: r.typical?.IS ?? null,
		n: r.typical?.N ?? null,
		rs: r.typical?.RS ?? null,
		rsh: r.typical?.RSH ?? null,
		samples: r.typical ? (r.isMeasured ? (r.sampleCount ?? 0) : -1) : null,
		vr: r.vr,
		updated: r.updated.getTime()
	}));
}
