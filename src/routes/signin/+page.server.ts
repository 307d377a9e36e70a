import { fail, redirect } from '@sveltejs/kit';
import { requestSignInLink } from '$lib/server/auth';
import { fieldErrors, signInForm } from '$lib/schemas/people';
import { allowSignInFrom } from '$lib/server/rate-limit';
import { returnPath } from '$lib/return-path';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const next = returnPath(url.searchParams.get('next'));
	if (locals.user) redirect(303, next);
	const error = url.searchParams.get('error');
	return {
		next,
		signedOut: url.searchParams.has('signedOut'),
		linkProblem:
			error === 'Verification'
				? 'That sign-in link has been used already or has expired. Ask for a new one below.'
				: error === 'AccessDenied'
					? 'That address is not on the team list. Ask an admin to invite you.'
					: error
						? 'Signing in did not work. Ask for a new link below.'
						: null
	};
};

export const actions: Actions = {
	default: async (event) => {
		const form = Object.fromEntries(await event.request.formData());
		const parsed = signInForm.safeParse(form);
		if (!parsed.success) {
			return fail(400, { values: { email: String(form.email ?? '') }, errors: fieldErrors(parsed.error) });
		}
		const { email, next } = parsed.data;
		if (!(await allowSignInFrom(event.getClientAddress()))) {
			return fail(429, { values: { email }, errors: { email: 'Too many sign-in requests from here; wait a few minutes.' } });
		}
		const outcome = await requestSignInLink(event, email, next);
		if (outcome === 'limited') {
			return fail(429, { values: { email }, errors: { email: 'Several links were sent to this address just now; use the newest, or wait 15 minutes.' } });
		}
		redirect(303, `/signin/check-mail?email=${encodeURIComponent(email)}`);
	}
};
