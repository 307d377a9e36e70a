// What a librarian sends to put a stored run right: the API's JSON bodies and the run
// page's forms (typed values with SI prefixes) arrive at the same schemas.
import { z } from 'zod';
import { sampleInput, temperatureC } from './catalogue';
import { optionalQuantity } from './quantity';

const reason = (required: string) => z.string({ message: required }).trim().min(1, required).max(1000, 'Keep the reason under 1000 characters.');
const optionalReason = z.string().trim().max(1000, 'Keep the reason under 1000 characters.').default('');

export const withdrawSchema = z.object({ reason: reason('Say why the run is withdrawn (wrong sample, fixture open, …).') }).strict();
export const reinstateSchema = z.object({ reason: reason('Say why the run counts again.') }).strict();

/** A voltage window [lo, hi] left out of a fit; null or absent: every point counts. */
export const excludeWindow = z
	.tuple([z.number().finite('excludeV[0] must be a finite voltage.'), z.number().finite('excludeV[1] must be a finite voltage.')], {
		message: 'excludeV is [lo, hi] in volts.'
	})
	.refine(([lo, hi]) => lo < hi, { message: 'The excluded window must start below where it ends.' });

/** C–V runs: the stray (fixture) capacitance subtracted before fitting [F]. */
const stray = z.number().finite('strayCapacitanceF must be a finite capacitance.').min(0, 'The stray capacitance is zero or more.').lt(1e-6, 'The stray capacitance is below 1 µF.');

export const refitSchema = z.object({ excludeV: excludeWindow.nullable().optional(), strayCapacitanceF: stray.optional(), reason: optionalReason }).strict();

export const correctSchema = z
	.object({ sample: sampleInput.shape.unit.optional(), temperatureC: temperatureC.optional(), reason: optionalReason })
	.strict()
	.refine((c) => c.sample !== undefined || c.temperatureC !== undefined, { message: 'Send the corrected sample, temperatureC, or both.', path: ['sample'] });

export type RefitInput = z.infer<typeof refitSchema>;
export type CorrectInput = z.infer<typeof correctSchema>;

/** Form fields keyed as the run page labels them. */
export type FieldErrors = Record<string, string>;

function firstIssues(e: z.ZodError, fieldOf: Record<string, string>, errors: FieldErrors) {
	for (const i of e.issues) errors[fieldOf[String(i.path[0])] ?? 'form'] ??= i.message;
}

/** The re-fit form's window as typed ("-0.2 V", "350m") and a C–V run's stray capacitance ("0.4 pF"), read by the engine's parser. */
const windowForm = z.object({
	fromV: optionalQuantity('voltage', 'From'),
	toV: optionalQuantity('voltage', 'To'),
	stray: optionalQuantity('capacitance', 'Stray capacitance')
});

/** The re-fit form: "from" and "to" as typed, both or neither; a C–V run's stray capacitance. */
export function refitFromForm(v: { fromV: string; toV: string; reason: string; stray?: string }): { input?: RefitInput; errors: FieldErrors } {
	const errors: FieldErrors = {};
	const w = windowForm.safeParse({ fromV: v.fromV, toV: v.toV, stray: v.stray ?? '' });
	if (!w.success) {
		firstIssues(w.error, { fromV: 'fromV', toV: 'toV', stray: 'stray' }, errors);
		return { errors };
	}
	const { fromV: lo, toV: hi, stray: strayF } = w.data;
	if ((lo === undefined) !== (hi === undefined)) {
		errors[lo === undefined ? 'fromV' : 'toV'] = 'Give both ends of the window, or neither to fit every point.';
		return { errors };
	}
	const r = refitSchema.safeParse({ excludeV: lo !== undefined && hi !== undefined ? [lo, hi] : null, reason: v.reason, ...(strayF !== undefined ? { strayCapacitanceF: strayF } : {}) });
	if (!r.success) {
		firstIssues(r.error, { excludeV: 'toV', reason: 'reason', strayCapacitanceF: 'stray' }, errors);
		return { errors };
	}
	return { input: r.data, errors };
}

/** The correction form: the sample label and the temperature as typed ("85 °C", "358.15 K"). */
export function correctionFromForm(v: { sample: string; temperature: string; reason: string }): { input?: CorrectInput; errors: FieldErrors } {
	const errors: FieldErrors = {};
	const r = correctSchema.safeParse({
		...(v.sample.trim() ? { sample: v.sample.trim() } : {}),
		...(v.temperature.trim() ? { temperatureC: v.temperature } : {}),
		reason: v.reason
	});
	if (!r.success) {
		firstIssues(r.error, { sample: 'sample', temperatureC: 'temperature', reason: 'reason' }, errors);
		return { errors };
	}
	return { input: r.data, errors };
}
