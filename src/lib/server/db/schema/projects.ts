import {
	serial,
	doublePrecision,
	index,
	integer,
	jsonb,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex
} from 'drizzle-orm/pg-core';
import { users } from './auth';
import { parts } from './catalogue';
import { timestamps } from './columns';
import type { NodeRequirement } from '../../../schemas/node';

/** A saved operating point (API units: volts, amperes, ohms, °C). */
export type Requirement = {
	biasV: number;
	temperatureC?: number;
	temperatureRangeC?: [number, number];
	clampCurrentA?: number;
	maxForwardDropV?: number;
	leakageTargetA?: number;
	/** Allowed error voltage across the source resistance, instead of a leakage target. */
	allowedErrorV?: number;
	sourceResistanceOhm?: number;
	/** A protected node the shortlist is judged in (every candidate position holding the part). */
	node?: NodeRequirement;
};

export const projects = pgTable(
	'projects',
	{
		id: serial('id').primaryKey(),
		name: text('name').notNull(),
		description: text('description').notNull().default(''),
		requirement: jsonb('requirement').$type<Requirement>().notNull(),
		/** The person who decides; null means anyone holding the lead role. */
		leadId: text('lead_id').references(() => users.id, { onDelete: 'set null' }),
		state: text('state').notNull().default('draft'),
		/** Bumped on every shortlist change and transition; a decision names the version it saw. */
		version: integer('version').notNull().default(1),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		...timestamps
	},
	(t) => [index('projects_state_idx').on(t.state)]
);

export const projectMembers = pgTable(
	'project_members',
	{
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		addedAt: timestamp('added_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.projectId, t.userId] })]
);

export const shortlistEntries = pgTable(
	'shortlist_entries',
	{
		id: serial('id').primaryKey(),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		partId: integer('part_id')
			.notNull()
			.references(() => parts.id, { onDelete: 'cascade' }),
		note: text('note').notNull().default(''),
		addedBy: text('added_by').references(() => users.id, { onDelete: 'set null' }),
		addedAt: timestamp('added_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
	},
	(t) => [uniqueIndex('shortlist_project_part_idx').on(t.projectId, t.partId)]
);

/** One row per review transition, with the predictions as they stood at that moment. */
export const reviewEvents = pgTable(
	'review_events',
	{
		id: serial('id').primaryKey(),
		projectId: integer('project_id')
			.notNull()
			.references(() => projects.id, { onDelete: 'cascade' }),
		action: text('action').notNull(),
		fromState: text('from_state').notNull(),
		toState: text('to_state').notNull(),
		projectVersion: integer('project_version').notNull(),
		comment: text('comment').notNull().default(''),
		actorId: text('actor_id').references(() => users.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		snapshot: jsonb('snapshot').$type<unknown>().notNull()
	},
	(t) => [index('review_events_project_idx').on(t.projectId, t.at)]
);

/** Named operating points a person keeps for the ranking screen. */
export const rankPresets = pgTable(
	'rank_presets',
	{
		id: serial('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		query: text('query').notNull(),
		leakageTargetA: doublePrecision('leakage_target_a'),
		...timestamps
	},
	(t) => [uniqueIndex('rank_presets_user_name_idx').on(t.userId, t.name)]
);
