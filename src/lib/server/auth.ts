import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { Auth, raw, skipCSRFCheck } from '@auth/core';
import type { RequestEvent } from '@sveltejs/kit';
import { and, count, eq, gt } from 'drizzle-orm';
import { db } from './db';
import { accounts, sessions, users, verificationTokens } from './db/schema';
import { readDeployment } from './deployment';
import { sendNow } from './mail';
import { escapeHtml } from './people';
import * as people from './people';
import { returnPath } from '$lib/return-path';

const SIGN_IN_LINK_MINUTES = 15;

const config: SvelteKitAuthConfig = {
	adapter: DrizzleAdapter(db, {
		usersTable: users,
		accountsTable: accounts,
		sessionsTable: sessions,
		verificationTokensTable: verificationTokens
	}),
	// Behind adapter-node ORIGIN is authoritative; production builds ignore AUTH_TRUST_HOST.
	trustHost: true,
	secret: process.env.AUTH_SECRET,
	basePath: '/auth',
	session: { strategy: 'database', maxAge: 30 * 24 * 3600 },
	pages: { signIn: '/signin', verifyRequest: '/signin/check-mail', error: '/signin' },
	providers: [
		Nodemailer({
			server: readDeployment().smtpUrl,
			from: process.env.MAIL_FROM ?? 'Junctionary <no-reply@junctionary.test>',
			maxAge: SIGN_IN_LINK_MINUTES * 60,
			async sendVerificationRequest({ identifier, url }) {
				await sendNow({
					to: identifier,
					subject: 'Your Junctionary sign-in link',
					text: `Open this link to sign in to Junctionary:\n${url}\n\nIt works once, within ${SIGN_IN_LINK_MINUTES} minutes. If you did not ask for it, ignore this message.\n`,
					html: `<p><a href="${escapeHtml(url)}">Sign in to Junctionary</a></p><p>The link works once, within ${SIGN_IN_LINK_MINUTES} minutes. If you did not ask for it, ignore this message.</p>`
				});
			}
		})
	],
	callbacks: {
		// Where a sign-in link (or any Auth.js callback address) leads: a path on this site.
		redirect({ url, baseUrl }) {
			const path = url.startsWith(baseUrl + '/') ? url.slice(baseUrl.length) : url;
			return baseUrl + returnPath(path);
		},
		// Only people an admin has added, and not deactivated, may sign in.
		async signIn({ user }) {
			return Boolean(user.email && people.maySignIn(await people.findByEmail(user.email)));
		},
		// The session row carries its token: hand pages nothing but who is signed in.
		session({ session }) {
			return { expires: session.expires, user: { name: session.user?.name, email: session.user?.email } } as never;
		}
	}
};

export const { handle: authHandle } = SvelteKitAuth(config);

export const SESSION_COOKIES = ['authjs.session-token', '__Secure-authjs.session-token'];

const PER_ADDRESS_PER_15_MIN = 5;

/**
 * Mails a one-time sign-in link when the address belongs to a person (silently does
 * nothing otherwise, so the form does not reveal who is a member). Limited per address.
 */
export async function requestSignInLink(event: RequestEvent, email: string, next: string): Promise<'sent' | 'limited'> {
	const address = email.trim().toLowerCase();
	const [{ n }] = await db
		.select({ n: count() })
		.from(verificationTokens)
		.where(
			and(
				eq(verificationTokens.identifier, address),
				gt(verificationTokens.expires, new Date()) // unused links of the last 15 minutes
			)
		);
	if (n >= PER_ADDRESS_PER_15_MIN) return 'limited';
	if (!people.maySignIn(await people.findByEmail(address))) return 'sent';
	const origin = event.url.origin;
	const request = new Request(`${origin}/auth/signin/nodemailer`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email: address, callbackUrl: `${origin}${next}` })
	});
	// The cross-site form check in hooks.server.ts (src/lib/server/csrf.ts) already guards the form action that calls this.
	await Auth(request, { ...config, raw, skipCSRFCheck });
	return 'sent';
}

export async function signOut(token: string | undefined) {
	if (token) await db.delete(sessions).where(eq(sessions.sessionToken, token));
}
