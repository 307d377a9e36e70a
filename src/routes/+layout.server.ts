import { readerFromRequest, TIME_ZONE_COOKIE } from '$lib/dates';
import { DEMO_BAND, isDemo } from '$lib/server/deployment';
import type { LayoutServerLoad } from './$types';

// Pages get who is signed in and their roles: never the session token. A demo says so on
// every page (the mailbox it points to holds everyone's sign-in links). `reader` is the
// locale and time zone dates are written in (see $lib/dates).
export const load: LayoutServerLoad = ({ locals, request, cookies }) => ({
	user: locals.user
		? { id: locals.user.id, name: locals.user.name, email: locals.user.email, roles: locals.user.roles }
		: null,
	demoBand: isDemo() ? DEMO_BAND : null,
	reader: readerFromRequest(request.headers.get('accept-language'), cookies.get(TIME_ZONE_COOKIE))
});
