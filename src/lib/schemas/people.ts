import { z } from 'zod';
import { ROLES } from '$lib/permissions';
import { returnPath } from '$lib/return-path';

export const email = z
	.string()
	.trim()
	.toLowerCase()
	.pipe(z.email({ message: 'Enter an e-mail address such as name@example.com.' }));

export const signInForm = z.object({
	email,
	// Only paths on this site, never another origin.
	next: z.string().optional().transform((n) => returnPath(n))
});

export const inviteForm = z.object({
	email,
	name: z.string().trim().min(1, 'Give the person a name.').max(120),
	roles: z.array(z.enum(ROLES)).default([])
});

export const roleChangeForm = z.object({
	userId: z.string().min(1),
	role: z.enum(ROLES),
	grant: z.enum(['1', '0']).transform((v) => v === '1'),
	/** Present once the admin has confirmed the change. */
	confirm: z.literal('1').optional()
});

const calendarDay = (what: string) =>
	z
		.string()
		.trim()
		.regex(/^\d{4}-\d{2}-\d{2}$/, `Give ${what} as a calendar date.`)
		.refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), `Give ${what} as a calendar date.`);

/** Longest life a new API token may be given, in days. */
export const TOKEN_MAX_DAYS = 366;
/** The life a token gets when no last day is given (the form's suggestion, scripts, the command line). */
export const TOKEN_DEFAULT_DAYS = 90;

/**
 * `expires`: the last calendar day the token works (in the reader's time zone); left out,
 * the token gets TOKEN_DEFAULT_DAYS.
 */
export const tokenForm = z.object({
	name: z.string().trim().min(1, 'Name the token after what uses it, e.g. "bench PC 2".').max(80, 'Keep the name under 80 characters.'),
	expires: z.union([z.literal('').transform(() => undefined), calendarDay('the last day it works')]).optional()
});

export const personForm = z.object({ userId: z.string().min(1), confirm: z.literal('1').optional() });

/** The audit page's filters, from its address. Empty fields mean "any". */
export const auditQuery = z
	.object({
		person: z.string().trim().max(100).default(''),
		action: z.string().trim().max(60).default(''),
		from: z.union([z.literal(''), calendarDay('the first day')]).default(''),
		to: z.union([z.literal(''), calendarDay('the last day')]).default(''),
		page: z.coerce.number().int().min(1).max(100_000).catch(1)
	})
	.refine((q) => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'The last day must not be before the first.' });

/** Field errors keyed by field name, as forms show them beside each input. */
export function fieldErrors(e: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of e.issues) {
		const key = String(issue.path[0] ?? 'form');
		out[key] ??= issue.message;
	}
	return out;
}
