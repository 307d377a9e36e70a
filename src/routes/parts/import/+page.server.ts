import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requirePermission } from '$lib/server/guards';
import { formFailure } from '$lib/server/errors';
import { readTable } from '$lib/server/sheets';
import { UPLOAD_LIMIT_BYTES } from '$lib/server/runs';
import * as partsImport from '$lib/server/parts-import';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = (event) => {
	requirePermission(event, 'catalogue:write');
	return { limitBytes: UPLOAD_LIMIT_BYTES };
};

/** The table as the preview read it, carried by the confirm form so the file is not sent twice. */
const carriedTable = z.object({
	header: z.array(z.union([z.string(), z.number(), z.boolean(), z.null()])).max(200),
	rows: z
		.array(z.object({ row: z.number().int().positive(), cells: z.array(z.union([z.string(), z.number(), z.boolean(), z.null()])).max(200) }))
		.max(20_000)
});

async function failWith(e: unknown, extra: Record<string, unknown> = {}) {
	return formFailure(e, (d) => ({ ...extra, error: d.message, issues: d.issues ?? [] }));
}

export const actions: Actions = {
	preview: async (event) => {
		requirePermission(event, 'catalogue:write');
		const file = (await event.request.formData()).get('file');
		if (!(file instanceof File) || file.size === 0) return fail(400, { error: 'Choose a parts list (.csv or .xlsx) first.', issues: [] });
		if (file.size > UPLOAD_LIMIT_BYTES) return fail(413, { error: `The file is ${file.size} bytes; parts lists up to ${UPLOAD_LIMIT_BYTES} bytes are accepted.`, issues: [] });
		try {
			const table = await readTable(new Uint8Array(await file.arrayBuffer()));
			return { fileName: file.name, table: JSON.stringify(table), preview: await partsImport.previewTable(table) };
		} catch (e) {
			return failWith(e);
		}
	},
	confirm: async (event) => {
		const user = requirePermission(event, 'catalogue:write');
		const fd = await event.request.formData();
		let table;
		try {
			table = carriedTable.parse(JSON.parse(String(fd.get('table') ?? '')));
		} catch {
			return fail(400, { error: 'The preview was lost; choose the file again.', issues: [] });
		}
		try {
			const out = await partsImport.importTable(user, table, String(fd.get('fingerprint') ?? '') || undefined);
			return { done: { created: out.created.length, updated: out.updated.length, unchanged: out.unchanged, fileName: String(fd.get('fileName') ?? '') } };
		} catch (e) {
			return failWith(e, { fileName: String(fd.get('fileName') ?? '') });
		}
	}
};
