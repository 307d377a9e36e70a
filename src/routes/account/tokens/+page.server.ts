import { fail } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import * as tokens from '$lib/server/tokens';
import { fieldErrors, TOKEN_DEFAULT_DAYS, TOKEN_MAX_DAYS, tokenForm } from '$lib/schemas/people';
import { dayInZone, endOfDay, readerFromRequest, TIME_ZONE_COOKIE } from '$lib/dates';
import type { RequestEvent } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';

/** The reader's time zone: a token's last day ends at midnight on their clock. */
const zoneOf = (event: RequestEvent) => readerFromRequest(event.request.headers.get('accept-language'), event.cookies.get(TIME_ZONE_COOKIE)).timeZone;

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'tokens:own');
	const zone = zoneOf(event);
	const now = new Date();
	return {
		tokens: await tokens.listFor(user.id),
		now,
		expiry: { suggested: dayInZone(now, zone, TOKEN_DEFAULT_DAYS), first: dayInZone(now, zone), last: dayInZone(now, zone, TOKEN_MAX_DAYS) }
	};
};

export const actions: Actions = {
	create: async (event) => {
		const user = requirePermission(event, 'tokens:own');
		const fd = await event.request.formData();
		const values = { name: String(fd.get('name') ?? ''), expires: String(fd.get('expires') ?? '') };
		const parsed = tokenForm.safeParse(values);
		if (!parsed.success) return fail(400, { values, errors: fieldErrors(parsed.error) });
		const zone = zoneOf(event);
		const now = Date.now();
		const expiresAt = endOfDay(parsed.data.expires ?? dayInZone(new Date(now), zone, TOKEN_DEFAULT_DAYS), zone);
		if (expiresAt.getTime() <= now) return fail(400, { values, errors: { expires: 'That day is over; choose today or a later day.' } as Record<string, string> });
		if (expiresAt.getTime() > endOfDay(dayInZone(new Date(now), zone, TOKEN_MAX_DAYS), zone).getTime())
			return fail(400, { values, errors: { expires: `A token lasts at most ${TOKEN_MAX_DAYS} days; choose an earlier day.` } as Record<string, string> });
		const created = await tokens.create(user.id, parsed.data.name, user.id, expiresAt);
		// Shown once in this response; only its hash is stored.
		return { created: { name: created.name, token: created.token, expiresAt: created.expiresAt } };
	},
	revoke: async (event) => {
		const user = requirePermission(event, 'tokens:own');
		const id = Number((await event.request.formData()).get('id'));
		if (!Number.isInteger(id) || !(await tokens.revoke(user.id, id))) return fail(404, { revokeError: 'No such active token.' });
		return { revoked: true };
	}
};
