import { json } from '@sveltejs/kit';
import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as runs from '$lib/server/runs';
import { readCvFit } from '$lib/server/upload';
import { capacitanceResiduals } from '$lib/catalogue/capacitance';

// Stateless C–V fit: { points: [{ voltageV, capacitanceF }], temperatureC?, strayCapacitanceF? }
// or a text/csv body (?temperatureC=, default 25; ?strayCapacitanceF=). Nothing is stored.
export const POST = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const body = await readCvFit(event);
	const prepared = runs.prepare(
		body.source,
		{ temperatureC: body.temperatureC, temperatureDefaulted: body.temperatureDefaulted, measurement: 'cv', strayCapacitanceF: body.strayCapacitanceF },
		{ material: 'silicon' }
	);
	if (prepared.measurement !== 'cv') throw new Error('a C–V fit came back as another measurement');
	const f = prepared.fit;
	const { CJO, VJ, M, FC } = f.model;
	return json({
		model: { CJO, VJ, M, FC },
		interval: f.interval,
		quality: { points: f.quality.points, excluded: f.quality.excluded, rejected: f.quality.rejected, rmsRelative: f.quality.rmsRelative, correlationVJM: f.quality.correlation },
		range: { voltageV: f.range.voltageV, capacitanceF: f.range.capacitanceF, fittedV: f.range.fittedV, temperatureC: f.range.temperatureC },
		strayCapacitanceF: f.strayCapacitanceF,
		residuals: capacitanceResiduals(prepared.points, f).map((p) => ({ voltageV: p.x, percent: p.y })),
		...(prepared.frequencyHz !== null ? { frequencyHz: prepared.frequencyHz } : {}),
		...(prepared.testLevelV !== null ? { testLevelV: prepared.testLevelV } : {}),
		warnings: prepared.warnings
	});
});
