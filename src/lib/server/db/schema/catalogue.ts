import {
	serial,
	boolean,
	customType,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	text,
	timestamp,
	uniqueIndex
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import type { RunState } from '../../../run-transitions';
import type { CapacitanceModel, CvFitInterval, CvFitQuality, CvFitRange, Measurement, PartCapacitance } from '../../../catalogue/capacitance';
import type { JunctionKind, Lifecycle, Material } from '../../../catalogue/vocabulary';
import type { FitInterval, FitQuality, FitRange, StoredModel } from '../../../catalogue/models';
import { users } from './auth';
import { timestamps } from './columns';

// The column types come from the browser-safe catalogue modules; server code may take them from here.
export type { FitInterval, FitQuality, FitRange, JunctionKind, Lifecycle, Material, StoredModel };

const bytea = customType<{ data: Buffer; driverData: Buffer }>({
	dataType: () => 'bytea'
});

export const parts = pgTable(
	'parts',
	{
		id: serial('id').primaryKey(),
		partNumber: text('part_number').notNull(),
		maker: text('maker').notNull(),
		kind: text('kind').$type<JunctionKind>().notNull(),
		/** Which pins form the junction, e.g. anode "1", cathode "2" (or "B"/"E" for bjt-be). */
		anodePins: text('anode_pins').notNull().default(''),
		cathodePins: text('cathode_pins').notNull().default(''),
		package: text('package').notNull().default(''),
		/** Glass, clear or LED packages let ambient light in: photocurrent beyond the dark leakage. */
		admitsLight: boolean('admits_light').notNull().default(false),
		material: text('material').$type<Material>().notNull().default('silicon'),
		ratedReverseV: doublePrecision('rated_reverse_v'),
		ratedForwardA: doublePrecision('rated_forward_a'),
		ratedJunctionC: doublePrecision('rated_junction_c'),
		/** Shunt leakage multiplies by this per 10 K (2 is common practice). */
		shuntFactorPer10K: doublePrecision('shunt_factor_per_10k').notNull().default(2),
		tags: text('tags').array().notNull().default([]),
		lifecycle: text('lifecycle').$type<Lifecycle>().notNull().default('in-use'),
		notes: text('notes').notNull().default(''),
		/** A model given directly (SPICE card, datasheet) before or instead of measurements. */
		givenModel: jsonb('given_model').$type<StoredModel>(),
		givenModelSource: text('given_model_source'),
		/** Bumped whenever anything that feeds a prediction changes. */
		modelVersion: integer('model_version').notNull().default(1),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		...timestamps
	},
	(t) => [
		uniqueIndex('parts_maker_number_idx').on(t.maker, t.partNumber),
		index('parts_kind_idx').on(t.kind),
		// Catalogue search (ILIKE '%…%' on each); parts_tags_text joins the tags by U+001F.
		index('parts_part_number_trgm_idx').using('gin', t.partNumber.op('gin_trgm_ops')),
		index('parts_maker_trgm_idx').using('gin', t.maker.op('gin_trgm_ops')),
		index('parts_tags_trgm_idx').using('gin', sql`parts_tags_text(${t.tags}) gin_trgm_ops`)
	]
);

export const samples = pgTable(
	'samples',
	{
		id: serial('id').primaryKey(),
		partId: integer('part_id')
			.notNull()
			.references(() => parts.id, { onDelete: 'cascade' }),
		unit: text('unit').notNull(),
		lot: text('lot').notNull().default(''),
		dateCode: text('date_code').notNull().default(''),
		...timestamps
	},
	(t) => [uniqueIndex('samples_part_unit_idx').on(t.partId, t.unit)]
);

export const SWEEP_DIRECTIONS = ['forward', 'reverse', 'both'] as const;
export type SweepDirection = (typeof SWEEP_DIRECTIONS)[number];

/** One measurement run: the original file byte for byte, and what was parsed from it. */
export const runs = pgTable(
	'runs',
	{
		id: serial('id').primaryKey(),
		partId: integer('part_id')
			.notNull()
			.references(() => parts.id, { onDelete: 'cascade' }),
		sampleId: integer('sample_id')
			.notNull()
			.references(() => samples.id, { onDelete: 'cascade' }),
		temperatureC: doublePrecision('temperature_c').notNull(),
		direction: text('direction').$type<SweepDirection>().notNull(),
		instrumentNote: text('instrument_note').notNull().default(''),
		operator: text('operator').notNull().default(''),
		measuredAt: timestamp('measured_at', { withTimezone: true, mode: 'date' }),
		fileName: text('file_name').notNull(),
		fileBytes: bytea('file_bytes').notNull(),
		fileSha256: text('file_sha256').notNull(),
		/** I–V (current) or C–V (capacitance) sweep. */
		measurement: text('measurement').$type<Measurement>().notNull().default('iv'),
		/** Parsed, merged points as [voltageV, currentA] pairs (C–V: [voltageV, capacitanceF]). */
		points: jsonb('points').$type<[number, number][]>().notNull(),
		/** C–V runs: the test-signal frequency [Hz] and level [V rms], when stated. */
		frequencyHz: doublePrecision('frequency_hz'),
		testLevelV: doublePrecision('test_level_v'),
		uploadedBy: text('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		/** Whether the run counts toward the part's model (src/lib/run-transitions.ts). */
		state: text('state').$type<RunState>().notNull().default('active'),
		/** Bumped by every change to the run; a change names the revision it started from. */
		revision: integer('revision').notNull().default(1),
		withdrawnAt: timestamp('withdrawn_at', { withTimezone: true, mode: 'date' }),
		withdrawnBy: text('withdrawn_by').references(() => users.id, { onDelete: 'set null' }),
		withdrawnReason: text('withdrawn_reason'),
		...timestamps
	},
	(t) => [
		uniqueIndex('runs_sha256_idx').on(t.fileSha256),
		index('runs_part_idx').on(t.partId),
		index('runs_sample_idx').on(t.sampleId)
	]
);

/** Why a fit version was made: the upload, a librarian's re-fit, or a corrected sample or temperature. */
export const FIT_CAUSES = ['upload', 'refit', 'correction'] as const;
export type FitCause = (typeof FIT_CAUSES)[number];


export const fits = pgTable(
	'fits',
	{
		id: serial('id').primaryKey(),
		runId: integer('run_id')
			.notNull()
			.references(() => runs.id, { onDelete: 'cascade' }),
		partId: integer('part_id')
			.notNull()
			.references(() => parts.id, { onDelete: 'cascade' }),
		sampleId: integer('sample_id')
			.notNull()
			.references(() => samples.id, { onDelete: 'cascade' }),
		/** The run's measurement says which: a Shockley model (I–V) or depletion parameters (C–V). */
		model: jsonb('model').$type<StoredModel | CapacitanceModel>().notNull(),
		interval: jsonb('interval').$type<FitInterval | CvFitInterval>().notNull(),
		quality: jsonb('quality').$type<FitQuality | CvFitQuality>().notNull(),
		range: jsonb('range').$type<FitRange | CvFitRange>().notNull(),
		/** Voltage window left out of the fit by a librarian's correction, if any. */
		excludedV: jsonb('excluded_v').$type<[number, number] | null>(),
		/** C–V fits: the stray (fixture) capacitance subtracted before fitting [F]. */
		strayCapacitanceF: doublePrecision('stray_capacitance_f'),
		fittedBy: text('fitted_by').references(() => users.id, { onDelete: 'set null' }),
		/** 1 for the upload's fit, then one more for each re-fit or correction of the run. */
		version: integer('version').notNull().default(1),
		cause: text('cause').$type<FitCause>().notNull().default('upload'),
		/** The librarian's words on why this version was made ('' for an upload). */
		note: text('note').notNull().default(''),
		/** Set when a newer version replaced this one; the run's current fit has none. */
		supersededAt: timestamp('superseded_at', { withTimezone: true, mode: 'date' }),
		...timestamps
	},
	(t) => [
		uniqueIndex('fits_run_version_idx').on(t.runId, t.version),
		uniqueIndex('fits_run_current_idx').on(t.runId).where(sql`${t.supersededAt} is null`),
		index('fits_part_idx').on(t.partId)
	]
);

/** Each part's model as the catalogue predicts with it: typical (median over samples),
 *  the worst sample, and what the measurements cover. Rebuilt in the transaction that
 *  changes a fit. */
export const partModels = pgTable('part_models', {
	partId: integer('part_id')
		.primaryKey()
		.references(() => parts.id, { onDelete: 'cascade' }),
	typical: jsonb('typical').$type<StoredModel>().notNull(),
	/** The sample with the highest predicted leakage at −1 V, 25 °C (the given model when nothing is
	 *  measured); kept for the API, while rankings and exports pick the worst sample at the operating point. */
	worst: jsonb('worst').$type<StoredModel>(),
	/** One model per sample, for the typical/worst prediction spread. */
	sampleModels: jsonb('sample_models').$type<StoredModel[]>().notNull(),
	/** Each sample's unit label, in the order of sampleModels (empty for a given model). */
	sampleUnits: jsonb('sample_units').$type<string[]>().notNull().default([]),
	spread: jsonb('spread').$type<Record<string, [number, number]>>().notNull().default({}),
	measured: jsonb('measured')
		.$type<{
			minCurrentA: number | null;
			temperaturesC: number[];
			reverseMeasured: boolean;
			worstRmsResidualV: number | null;
		}>()
		.notNull(),
	sampleCount: integer('sample_count').notNull(),
	/** False when the model came from a card or datasheet and no runs back it. */
	isMeasured: boolean('is_measured').notNull(),
	version: integer('version').notNull(),
	...timestamps
});

/** Each part's junction capacitance as predictions use it: the median over its samples' C–V
 *  fits, or a given card's CJO/VJ/M. Rebuilt with part_models; absent when neither exists. */
export const partCapacitance = pgTable('part_capacitance', {
	partId: integer('part_id')
		.primaryKey()
		.references(() => parts.id, { onDelete: 'cascade' }),
	source: text('source').$type<PartCapacitance['source']>().notNull(),
	typical: jsonb('typical').$type<PartCapacitance['typical']>().notNull(),
	spread: jsonb('spread').$type<PartCapacitance['spread']>().notNull().default({}),
	samples: jsonb('samples').$type<PartCapacitance['samples']>().notNull().default([]),
	...timestamps
});
