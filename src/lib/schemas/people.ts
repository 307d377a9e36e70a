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
	grant: z.enum(['1', '0']).transform((v) => v === '1')
});

export const tokenForm = z.object({
	name: z.string().trim().min(1, 'Name the token after what uses it, e.g. "bench PC 2".').max(80)
});

/** Field errors keyed by field name, as forms show them beside each input. */
export function fieldErrors(e: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of e.issues) {
		const key = String(issue.path[0] ?? 'form');
		out[key] ??= issue.message;
	}
	return out;
}
