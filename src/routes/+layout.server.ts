import type { LayoutServerLoad } from './$types';

// Pages get who is signed in and their roles: never the session token.
export const load: LayoutServerLoad = ({ locals }) => ({
	user: locals.user
		? { id: locals.user.id, name: locals.user.name, email: locals.user.email, roles: locals.user.roles }
		: null,
	devMailbox: process.env.DEV_MAILBOX === '1'
});
