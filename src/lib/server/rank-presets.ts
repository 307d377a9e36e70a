/** Named operating points a person keeps (rank_presets): the query string and its leakage budget. */
import { and, asc, eq } from 'drizzle-orm';
import { z } from 'zod';
import { db } from './db';
import { rankPresets } from './db/schema';
import { DomainError } from './errors';
import { operatingPointFromQuery } from '$lib/rank/operating-point-url';
import { leakageBudget } from './ranking';

export const presetForm = z.object({
	name: z.string().trim().min(1, 'Give the preset a name.').max(80, 'Keep the name under 80 characters.'),
	query: z.string().max(2000, 'The operating point is too long to keep.')
});

export async function listPresets(userId: string) {
	return db
		.select({ id: rankPresets.id, name: rankPresets.name, query: rankPresets.query, leakageTargetA: rankPresets.leakageTargetA })
		.from(rankPresets)
		.where(eq(rankPresets.userId, userId))
		.orderBy(asc(rankPresets.name));
}

/** Saves (or overwrites, by name) a preset; the query must be a valid operating point. */
export async function savePreset(userId: string, input: z.infer<typeof presetForm>) {
	const query = input.query.replace(/^\?/, '');
	const { op, errors } = operatingPointFromQuery(new URLSearchParams(query));
	if (!op) {
		throw new DomainError(
			422,
			'Fix the operating point before saving it.',
			Object.entries(errors).map(([path, message]) => ({ path, message: String(message) }))
		);
	}
	const leakageTargetA = leakageBudget(op);
	await db
		.insert(rankPresets)
		.values({ userId, name: input.name, query, leakageTargetA })
		.onConflictDoUpdate({ target: [rankPresets.userId, rankPresets.name], set: { query, leakageTargetA, updatedAt: new Date() } });
}

export async function deletePreset(userId: string, id: number) {
	await db.delete(rankPresets).where(and(eq(rankPresets.userId, userId), eq(rankPresets.id, id)));
}
