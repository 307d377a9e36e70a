import { json } from '@sveltejs/kit';
import { desc } from 'drizzle-orm';
import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import { db } from '$lib/server/db';
import { parts } from '$lib/server/db/schema';
import { fail } from '$lib/server/http-error';

// Placeholder until the catalogue lands: lists parts, refuses creation politely.
export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const rows = await db.select().from(parts).orderBy(desc(parts.id)).limit(50);
	return json({ items: rows, nextCursor: null });
});

export const POST = endpoint(async (event) => {
	requirePermission(event, 'catalogue:write');
	fail(422, 'Creating parts is not available yet.');
});
