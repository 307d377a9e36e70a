import { requirePermission } from '$lib/server/guards';
import * as auditLog from '$lib/server/audit-log';
import * as people from '$lib/server/people';
import { auditQuery, fieldErrors } from '$lib/schemas/people';
import { readerFromRequest, startOfDay, endOfDay, TIME_ZONE_COOKIE } from '$lib/dates';
import type { PageServerLoad } from './$types';

// The audit log, newest first; filters live in the address so a view can be shared.
export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'people:manage');
	const q = event.url.searchParams;
	const raw = { person: q.get('person') ?? '', action: q.get('action') ?? '', from: q.get('from') ?? '', to: q.get('to') ?? '', page: q.get('page') ?? '1' };
	const parsed = auditQuery.safeParse(raw);
	const [everyone, actions] = await Promise.all([people.list(), auditLog.actions()]);
	const choices = { people: everyone.map((p) => ({ id: p.id, name: p.name, email: p.email })), actions };
	if (!parsed.success) return { filter: raw, errors: fieldErrors(parsed.error), entries: [], total: 0, page: 1, pages: 1, ...choices };
	const f = parsed.data;
	// Days are the reader's: "from 2 Dec" starts at midnight on their clock.
	const zone = readerFromRequest(event.request.headers.get('accept-language'), event.cookies.get(TIME_ZONE_COOKIE)).timeZone;
	const found = await auditLog.search({
		actorId: f.person || undefined,
		action: f.action || undefined,
		from: f.from ? startOfDay(f.from, zone) : undefined,
		until: f.to ? endOfDay(f.to, zone) : undefined,
		page: f.page
	});
	const page = Math.min(f.page, found.pages);
	return { filter: { ...raw, page: String(page) }, errors: {} as Record<string, string>, entries: found.entries, total: found.total, page, pages: found.pages, ...choices };
};
