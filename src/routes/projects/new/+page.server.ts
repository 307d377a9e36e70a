import { fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { DomainError } from '$lib/server/errors';
import * as projects from '$lib/server/projects';
import * as people from '$lib/server/people';
import { createProjectSchema, emailList, REQUIREMENT_FIELDS, requirementFromForm, requirementToForm, type RequirementForm } from '$lib/schemas/projects';
import { fieldsFromQuery, parseFields } from '$lib/rank/operating-point-url';
import type { Actions, PageServerLoad } from './$types';

/**
 * The requirement fields a ranking's address fills in (`/projects/new?v=-5&thi=85…`, the
 * ranking screen's own query). Its filters (kinds, packages, lifecycles, text) are not part
 * of a requirement and are left behind.
 */
function fromRanking(query: URLSearchParams): RequirementForm | null {
	if (!query.has('v') && !query.has('tlo') && !query.has('thi')) return null;
	const f = fieldsFromQuery(query);
	const { op } = parseFields(f);
	if (op) return requirementToForm(op);
	return { bias: f.bias, tempLo: f.tLo, tempHi: f.tHi, clamp: f.clamp, maxDrop: f.maxDrop, leakageTarget: f.leakage, allowedError: f.allowedError, sourceR: f.source };
}

export const load: PageServerLoad = async (event) => {
	requirePermission(event, 'project:create');
	const leads = await people.listWithRole('lead');
	return { leads: leads.map((l) => ({ email: l.email, name: l.name })), fromRanking: fromRanking(event.url.searchParams) };
};

export const actions: Actions = {
	default: async (event) => {
		const user = requirePermission(event, 'project:create');
		const fd = await event.request.formData();
		const text = (k: string) => String(fd.get(k) ?? '');
		const values: Record<string, string> = { name: text('name'), description: text('description'), leadEmail: text('leadEmail'), members: text('members') };
		for (const f of REQUIREMENT_FIELDS) values[f] = text(f);
		const { requirement, errors } = requirementFromForm(values as RequirementForm);
		const members = emailList(values.members);
		if (members.error) errors.members = members.error;
		const parsed = createProjectSchema.safeParse({
			name: values.name,
			description: values.description,
			leadEmail: values.leadEmail,
			memberEmails: members.emails,
			requirement: requirement ?? { biasV: 0, temperatureC: 25 }
		});
		if (!parsed.success) for (const i of parsed.error.issues) errors[String(i.path[0])] ??= i.message;
		if (Object.keys(errors).length || !parsed.success) return fail(400, { values, errors });
		try {
			const p = await projects.create(parsed.data, user.id);
			redirect(303, `/projects/${p.id}`);
		} catch (e) {
			if (e instanceof DomainError) {
				for (const i of e.issues ?? []) errors[i.path?.startsWith('memberEmails') ? 'members' : (i.path ?? 'form')] = i.message;
				if (!e.issues?.length) errors.form = e.message;
				return fail(e.status === 404 ? 400 : e.status, { values, errors });
			}
			throw e;
		}
	}
};
