/**
 * Which sample a SPICE export is made from: GET /api/v1/junctions/{id}/spice,
 * /parts/{id}/spice and /projects/{id}/export/spice read it from the query string.
 *  - sample=typical (default): the typical model (median over samples, each parameter on its own);
 *  - sample=worst with biasV and temperatureC: the sample that leaks most at that point;
 *  - sample=<unit>: the named sample (its unit label as the part page lists it).
 */
import { z } from 'zod';
import { parseTemperature, parseVoltage } from '$lib/junction/units';

export type SampleChoice =
	| { sample: 'typical' }
	| { sample: 'worst'; biasV: number; temperatureC: number }
	| { sample: 'unit'; unit: string };

/** A quantity as typed ("-5", "-5 V", "−5 V", "85 °C"), read by the engine's unit parser. */
const quantity = (what: string, parse: (text: string) => number) =>
	z
		.string()
		.trim()
		.min(1, `${what} is needed with sample=worst`)
		.transform((t, ctx) => {
			try {
				return parse(t);
			} catch (e) {
				ctx.addIssue({ code: 'custom', message: `${what}: ${(e as Error).message}` });
				return z.NEVER;
			}
		});

const spiceQuerySchema = z
	.object({
		sample: z.string().trim().min(1, 'sample must be typical, worst or a sample unit').max(60, 'sample is at most 60 characters').optional(),
		biasV: quantity('biasV', parseVoltage).optional(),
		temperatureC: quantity('temperatureC', (t) => parseTemperature(t).celsius).optional()
	})
	.transform((q, ctx): SampleChoice => {
		const s = q.sample ?? 'typical';
		if (s === 'typical') return { sample: 'typical' };
		if (s === 'worst') {
			if (q.biasV === undefined || q.temperatureC === undefined) {
				ctx.addIssue({
					code: 'custom',
					path: [q.biasV === undefined ? 'biasV' : 'temperatureC'],
					message: 'sample=worst needs the operating point: biasV (volts) and temperatureC (°C), e.g. ?sample=worst&biasV=-5&temperatureC=85'
				});
				return z.NEVER;
			}
			if (!(q.temperatureC > -273.15 && q.temperatureC < 1000)) {
				ctx.addIssue({ code: 'custom', path: ['temperatureC'], message: 'temperatureC must lie between absolute zero and 1000 °C' });
				return z.NEVER;
			}
			return { sample: 'worst', biasV: q.biasV, temperatureC: q.temperatureC };
		}
		return { sample: 'unit', unit: s };
	});

/** Reads the choice from URL search parameters (unknown parameters are ignored). */
export function sampleChoiceFrom(params: URLSearchParams) {
	const pick = (k: string) => params.get(k) ?? undefined;
	return spiceQuerySchema.safeParse({ sample: pick('sample'), biasV: pick('biasV'), temperatureC: pick('temperatureC') });
}

/** The approved project's library: each part's typical model, or each part's leakiest sample at the requirement. */
export const projectLibraryQuerySchema = z.object({
	sample: z.enum(['typical', 'worst'], { message: 'sample must be typical or worst for a project library' }).default('typical')
});
