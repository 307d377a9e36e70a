import { json } from '@sveltejs/kit';
import { endpoint, readJson, zodIssues } from '$lib/server/api';
import { DomainError } from '$lib/server/errors';
import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { catalogueQuery, partInput } from '$lib/schemas/catalogue';

export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const parsed = catalogueQuery.safeParse(Object.fromEntries(event.url.searchParams));
	if (!parsed.success) throw new DomainError(400, 'The query parameters are not valid.', zodIssues(parsed.error));
	return json(await catalogue.list(parsed.data));
});

export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	const input = await readJson(event, partInput);
	const part = await catalogue.create(user, input);
	const d = await catalogue.detail(part.id);
	return json(catalogue.present(part, d?.model ?? null, d?.capacitance ?? null), { status: 201 });
});
