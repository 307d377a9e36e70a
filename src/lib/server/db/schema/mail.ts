import { bigserial, index, integer, pgTable, text, timestamp } from 'drizzle-orm/pg-core';

/** Outgoing mail is written here in the same transaction as the change that causes it,
 *  then delivered (and retried) by the outbox worker, so a mail server outage never
 *  loses or blocks a decision. */
export const mailOutbox = pgTable(
	'mail_outbox',
	{
		id: bigserial('id', { mode: 'number' }).primaryKey(),
		to: text('to').notNull(),
		subject: text('subject').notNull(),
		text: text('text').notNull(),
		html: text('html').notNull(),
		createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
		attempts: integer('attempts').notNull().default(0),
		nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true, mode: 'date' })
			.notNull()
			.defaultNow(),
		sentAt: timestamp('sent_at', { withTimezone: true, mode: 'date' }),
		lastError: text('last_error')
	},
	(t) => [index('mail_outbox_due_idx').on(t.sentAt, t.nextAttemptAt)]
);
