import { error } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import type { RequestHandler } from './$types';

// The typical model as a SPICE .model card; ?sim=1 leaves out the catalogue's own keys.
export const GET: RequestHandler = async (event) => {
	requirePermission(event, 'catalogue:read');
	const card = await catalogue.spiceCard(Number(event.params.id), event.url.searchParams.get('sim') === '1');
	if (!card) error(404, { message: 'This part has no model yet.', code: 'not_found' });
	return new Response(card.text, {
		headers: { 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${card.name}.lib"` }
	});
};
