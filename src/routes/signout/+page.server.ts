import { redirect } from '@sveltejs/kit';
import { SESSION_COOKIES, signOut } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	default: async ({ cookies }) => {
		for (const name of SESSION_COOKIES) {
			await signOut(cookies.get(name));
			cookies.delete(name, { path: '/' });
		}
		redirect(303, '/signin?signedOut=1');
	}
};
