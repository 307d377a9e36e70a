// What arrives with a C–V sweep: its points, and the settings recorded with the run (test
// frequency and level, the stray capacitance to subtract). Numbers in SI units from JSON, or
// typed with SI prefixes and units ("1 MHz", "30 mV", "0.4 pF") from forms and query strings.
import { z } from 'zod';
import { parseQuantity, type QuantityKind } from '$lib/junction/units';
import { MEASUREMENTS } from '$lib/catalogue/capacitance';
import { pointsInput, temperatureC } from './catalogue';

/** A number in SI units, or text the engine's quantity parser reads ("1 MHz", "0,4 pF"). */
function quantity(kind: QuantityKind, label: string) {
	return z.union([z.number(), z.string()]).transform((raw, ctx) => {
		let v = raw as number;
		if (typeof raw === 'string') {
			try {
				v = parseQuantity(raw, kind);
			} catch (e) {
				ctx.addIssue({ code: 'custom', message: `${label}: ${(e as Error).message}` });
				return z.NEVER;
			}
		}
		if (!Number.isFinite(v)) {
			ctx.addIssue({ code: 'custom', message: `${label} must be a finite number.` });
			return z.NEVER;
		}
		return v;
	});
}

export const frequencyHz = quantity('frequency', 'Test frequency').refine((v) => v > 0 && v <= 1e9, 'Test frequency must be above 0 Hz and at most 1 GHz.');
export const testLevelV = quantity('voltage', 'Test-signal level').refine((v) => v > 0 && v <= 10, 'Test-signal level must be above 0 V and at most 10 V rms.');
export const strayCapacitanceF = quantity('capacitance', 'Stray capacitance').refine((v) => v >= 0 && v < 1e-6, 'Stray capacitance is zero or more, below 1 µF.');

export const measurement = z.enum(MEASUREMENTS, { message: `measurement is one of ${MEASUREMENTS.join(', ')}.` });

const cvPoints = z
	.array(z.object({ voltageV: z.number().finite(), capacitanceF: z.number().finite() }).strict(), {
		message: 'points must be a list of { voltageV, capacitanceF }.'
	})
	.min(1, 'Send at least one point.')
	.max(100_000, 'At most 100 000 points.');

/** The C–V run settings, each optional. */
export const cvSettings = z.object({
	frequencyHz: frequencyHz.optional(),
	testLevelV: testLevelV.optional(),
	strayCapacitanceF: strayCapacitanceF.optional()
});
export type CvSettings = z.infer<typeof cvSettings>;

/** A C–V run sent as JSON points (POST /api/v1/junctions/{id}/runs). */
export const cvPointsUpload = pointsInput
	.omit({ points: true, direction: true })
	.extend({ measurement: z.literal('cv').optional(), points: cvPoints, excludeFromV: z.number().optional(), excludeToV: z.number().optional() })
	.extend(cvSettings.shape)
	.strict();

/** A stateless C–V fit (POST /api/v1/fit/capacitance) as JSON. */
export const capacitanceFitInput = z
	.object({ points: cvPoints, temperatureC: temperatureC.default(25), strayCapacitanceF: strayCapacitanceF.optional() })
	.strict();

/** True when a JSON upload is a C–V run: said so, or its points carry capacitances. */
export function isCvBody(body: unknown): boolean {
	if (!body || typeof body !== 'object') return false;
	const b = body as { measurement?: unknown; points?: unknown };
	if (b.measurement === 'cv') return true;
	return Array.isArray(b.points) && b.points.some((p) => p !== null && typeof p === 'object' && 'capacitanceF' in p);
}
