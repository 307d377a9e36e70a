import { json } from '@sveltejs/kit';
import { endpoint, readQuery } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runs from '$lib/server/runs';
import { readIvFit } from '$lib/server/upload';
import { fitQuerySchema } from '$lib/schemas/queries';

// Stateless fit: { temperatureC, points } or a text/csv body (?temperatureC=, default 25).
// `?material=` picks the junction material (silicon unless said otherwise).
export const POST = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const { material } = readQuery(event.url, fitQuerySchema);
	const body = await readIvFit(event);
	const prepared = runs.prepare(body.source, { temperatureC: body.temperatureC, temperatureDefaulted: body.temperatureDefaulted, measurement: 'iv' }, { material });
	if (prepared.measurement !== 'iv') throw new Error('an I–V fit came back as another measurement');
	const f = prepared.fit;
	return json({
		model: f.model,
		interval: f.interval,
		quality: f.quality,
		range: { currentA: f.range.currentA, voltageV: f.range.voltageV, temperatureC: f.range.temperatureC },
		warnings: prepared.warnings
	});
});
