import { error } from '@sveltejs/kit';
import type { CaughtMessage } from '$lib/server/mail-catcher';
import { isLoopback, readDeployment } from '$lib/server/deployment';
import type { PageServerLoad } from './$types';

// The demo's view of the local mail catcher. It lists everyone's sign-in links, so it
// exists only in a demo (no SMTP_URL) and answers only callers on this machine.
export const load: PageServerLoad = async ({ url, fetch, getClientAddress }) => {
	const deployment = readDeployment();
	if (deployment.mode !== 'demo' || !isLoopback(getClientAddress())) error(404, { message: 'Not found.', code: 'not_found' });
	const to = url.searchParams.get('to') ?? '';
	try {
		const res = await fetch(`${deployment.mailboxUrl}/messages${to ? `?to=${encodeURIComponent(to)}` : ''}`);
		return { to, messages: (await res.json()) as CaughtMessage[], catcherDown: false };
	} catch {
		return { to, messages: [] as CaughtMessage[], catcherDown: true };
	}
};
