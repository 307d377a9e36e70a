import {
	serial,
	index,
	integer,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex
} from 'drizzle-orm/pg-core';
import type { AdapterAccountType } from '@auth/core/adapters';
import type { Role } from '../../../permissions';
import { timestamps } from './columns';

// The four tables Auth.js's Drizzle adapter reads and writes; property names are the
// adapter's, columns are ours (snake_case).
export const users = pgTable('users', {
	id: text('id')
		.primaryKey()
		.$defaultFn(() => crypto.randomUUID()),
	name: text('name'),
	email: text('email').notNull().unique(),
	emailVerified: timestamp('email_verified', { withTimezone: true, mode: 'date' }),
	image: text('image'),
	/** Set while an admin has deactivated the person: no sign-in, no sessions, no tokens; history kept. */
	deactivatedAt: timestamp('deactivated_at', { withTimezone: true, mode: 'date' }),
	...timestamps
});

export const accounts = pgTable(
	'accounts',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		type: text('type').$type<AdapterAccountType>().notNull(),
		provider: text('provider').notNull(),
		providerAccountId: text('provider_account_id').notNull(),
		refresh_token: text('refresh_token'),
		access_token: text('access_token'),
		expires_at: integer('expires_at'),
		token_type: text('token_type'),
		scope: text('scope'),
		id_token: text('id_token'),
		session_state: text('session_state')
	},
	(t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })]
);

export const sessions = pgTable(
	'sessions',
	{
		sessionToken: text('session_token').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull()
	},
	// Expired sessions are pruned by expiry (src/lib/server/prune.ts).
	(t) => [index('sessions_user_idx').on(t.userId), index('sessions_expires_idx').on(t.expires)]
);

export const verificationTokens = pgTable(
	'verification_tokens',
	{
		identifier: text('identifier').notNull(),
		token: text('token').notNull(),
		expires: timestamp('expires', { withTimezone: true, mode: 'date' }).notNull()
	},
	(t) => [primaryKey({ columns: [t.identifier, t.token] }), index('verification_tokens_expires_idx').on(t.expires)]
);

/**
 * Fixed-window request counters shared by every app process (sign-in requests per client
 * address): one row per key, counted and reset by a single upsert on the database clock.
 */
export const rateLimits = pgTable(
	'rate_limits',
	{
		key: text('key').primaryKey(),
		hits: integer('hits').notNull(),
		windowEndsAt: timestamp('window_ends_at', { withTimezone: true, mode: 'date' }).notNull()
	},
	(t) => [index('rate_limits_window_idx').on(t.windowEndsAt)]
);

export const userRoles = pgTable(
	'user_roles',
	{
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: text('role').$type<Role>().notNull(),
		grantedAt: timestamp('granted_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		grantedBy: text('granted_by').references(() => users.id, { onDelete: 'set null' })
	},
	(t) => [primaryKey({ columns: [t.userId, t.role] })]
);

/** Personal API tokens: only the SHA-256 of the secret is kept. */
export const apiTokens = pgTable(
	'api_tokens',
	{
		id: serial('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		tokenHash: text('token_hash').notNull(),
		prefix: text('prefix').notNull(),
		lastUsedAt: timestamp('last_used_at', { withTimezone: true, mode: 'date' }),
		revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
		/** The token stops working at this instant; null for tokens made before expiry dates existed. */
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }),
		...timestamps
	},
	(t) => [uniqueIndex('api_tokens_hash_idx').on(t.tokenHash), index('api_tokens_user_idx').on(t.userId)]
);
