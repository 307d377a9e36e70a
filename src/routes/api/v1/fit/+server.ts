import { json } from '@sveltejs/kit';
import { DomainError, endpoint, zodIssues } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runs from '$lib/server/runs';
import { fitInput } from '$lib/schemas/catalogue';
import { bodyBytes, checkLength, parseTemperature } from '$lib/server/upload';
import { MATERIALS, type Material } from '$lib/catalogue/vocabulary';

// Stateless fit: { temperatureC, points } or a text/csv body (?temperatureC=, default 25).
// `?material=` picks the junction material (silicon unless said otherwise).
export const POST = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	await checkLength(event);
	const type = (event.request.headers.get('content-type') ?? '').toLowerCase();
	const matRaw = event.url.searchParams.get('material') ?? 'silicon';
	if (!(MATERIALS as readonly string[]).includes(matRaw))
		throw new DomainError(400, `material is one of ${MATERIALS.join(', ')}.`, [{ path: 'material', message: 'unknown material' }]);
	const ctx = { material: matRaw as Material };
	let prepared: runs.PreparedRun;
	if (type.startsWith('application/json')) {
		let body: unknown;
		try {
			body = JSON.parse(new TextDecoder().decode(await bodyBytes(event)));
		} catch (e) {
			if (e instanceof DomainError) throw e;
			throw new DomainError(400, 'The body is not valid JSON.');
		}
		const r = fitInput.safeParse(body);
		if (!r.success) throw new DomainError(400, 'The request does not match { temperatureC, points: [{ voltageV, currentA }] }.', zodIssues(r.error));
		prepared = runs.prepare({ kind: 'points', points: r.data.points }, { temperatureC: r.data.temperatureC }, ctx);
	} else {
		const bytes = await bodyBytes(event);
		const t = parseTemperature(event.url.searchParams.get('temperatureC'));
		prepared = runs.prepare({ kind: 'file', fileName: 'sweep.csv', bytes }, { temperatureC: t ?? 25, temperatureDefaulted: t === undefined }, ctx);
	}
	const f = prepared.fit;
	return json({
		model: f.model,
		interval: f.interval,
		quality: f.quality,
		range: { currentA: f.range.currentA, voltageV: f.range.voltageV, temperatureC: f.range.temperatureC },
		warnings: prepared.warnings
	});
});
