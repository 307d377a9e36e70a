import { json } from '@sveltejs/kit';
import { endpoint } from '$lib/server/api';
import { DomainError } from '$lib/server/errors';
import { requirePermission } from '$lib/server/guards';
import { bodyBytes, checkLength } from '$lib/server/upload';
import { readTable } from '$lib/server/sheets';
import * as partsImport from '$lib/server/parts-import';

// A parts list as the body (text/csv or the .xlsx file itself, or multipart with "file").
// ?dryRun=1 answers the preview and writes nothing; otherwise the whole list is imported in
// one transaction, or nothing is when any row has a problem (422, each issue with row and column).
export const POST = endpoint(async (event) => {
	const user = requirePermission(event, 'catalogue:write');
	await checkLength(event);
	let bytes: Uint8Array;
	if ((event.request.headers.get('content-type') ?? '').toLowerCase().startsWith('multipart/form-data')) {
		const file = (await event.request.formData().catch(() => null))?.get('file');
		if (!(file instanceof File)) throw new DomainError(400, 'Attach the parts list as the form field "file".', [{ path: 'file', message: 'missing file' }]);
		bytes = new Uint8Array(await file.arrayBuffer());
	} else bytes = await bodyBytes(event);
	const table = await readTable(bytes);
	if (event.url.searchParams.get('dryRun') === '1') return json({ dryRun: true, ...(await partsImport.previewTable(table)) });
	const out = await partsImport.importTable(user, table, event.url.searchParams.get('fingerprint') ?? undefined);
	const wrote = out.created.length + out.updated.length > 0;
	return json({ id: out.id, created: out.created, updated: out.updated, unchanged: out.unchanged, ...out.preview }, { status: wrote ? 201 : 200 });
});
