import { error } from '@sveltejs/kit';
import type { CaughtMessage } from '$lib/server/mail-catcher';
import type { PageServerLoad } from './$types';

// A development-only view of the local mail catcher; absent unless DEV_MAILBOX=1.
export const load: PageServerLoad = async ({ url, fetch }) => {
	if (process.env.DEV_MAILBOX !== '1') error(404, { message: 'Not found.', code: 'not_found' });
	const to = url.searchParams.get('to') ?? '';
	const base = process.env.MAIL_CATCHER_URL ?? 'http://127.0.0.1:2526';
	try {
		const res = await fetch(`${base}/messages${to ? `?to=${encodeURIComponent(to)}` : ''}`);
		return { to, messages: (await res.json()) as CaughtMessage[], catcherDown: false };
	} catch {
		return { to, messages: [] as CaughtMessage[], catcherDown: true };
	}
};
