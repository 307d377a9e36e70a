import { z } from 'zod';
import { quantityText } from '$lib/quantity';
import { optionalQuantity, quantity } from './quantity';
import { REVIEW_ACTIONS } from '$lib/review-transitions';
import { email } from './people';
import { MAX_ID } from '../../params/id';
import { nodeRequirementSchema } from './node';

const finite = (what: string) => z.number({ message: `${what} must be a number.` }).refine(Number.isFinite, `${what} must be finite.`);
const celsius = (what: string) => finite(what).min(-273.15, `${what} is below absolute zero.`).max(500, `${what} is above 500 °C.`);

/**
 * The requirement as stored and as the API takes it: volts, amperes, ohms, °C. The leakage
 * limit is a leakage target, or an allowed error voltage across the source resistance (the
 * ranking's two ways of saying it). Messages name each value as the project screens label it.
 */
const requirementSchema = z
	.object({
		biasV: finite('The bias').min(-10_000, 'The bias must be within 10 kV reverse.').max(100, 'The bias must be at most 100 V forward.'),
		temperatureC: celsius('The temperature').optional(),
		temperatureRangeC: z.tuple([celsius('The cold end'), celsius('The hot end')]).optional(),
		clampCurrentA: finite('The clamp current').positive('The clamp current must be above zero.').max(1000, 'The clamp current must be at most 1 kA.').optional(),
		maxForwardDropV: finite('The forward-drop limit').positive('The forward-drop limit must be above zero.').max(100, 'The forward-drop limit must be at most 100 V.').optional(),
		leakageTargetA: finite('The leakage target').positive('The leakage target must be above zero.').max(1, 'The leakage target must be at most 1 A.').optional(),
		allowedErrorV: finite('The allowed error').positive('The allowed error must be above zero.').max(1000, 'The allowed error must be at most 1 kV.').optional(),
		sourceResistanceOhm: finite('The source resistance').min(0, 'The source resistance cannot be negative.').optional(),
		/** A protected node the shortlist is judged in; candidate positions take each listed part. */
		node: nodeRequirementSchema.optional()
	})
	.strict()
	.superRefine((r, ctx) => {
		if (r.temperatureC === undefined && r.temperatureRangeC === undefined)
			ctx.addIssue({ code: 'custom', path: ['temperatureC'], message: 'Give at least one temperature (temperatureC, or temperatureRangeC as [cold, hot]).' });
		if (r.temperatureC !== undefined && r.temperatureRangeC !== undefined)
			ctx.addIssue({ code: 'custom', path: ['temperatureRangeC'], message: 'Give one temperature or a range, not both.' });
		if (r.temperatureRangeC && r.temperatureRangeC[0] > r.temperatureRangeC[1])
			ctx.addIssue({ code: 'custom', path: ['temperatureRangeC'], message: 'The cold end must not be above the hot end.' });
		if (r.maxForwardDropV !== undefined && r.clampCurrentA === undefined)
			ctx.addIssue({ code: 'custom', path: ['clampCurrentA'], message: 'A forward-drop limit needs the clamp current it applies at.' });
		if (r.allowedErrorV !== undefined && r.leakageTargetA !== undefined)
			ctx.addIssue({ code: 'custom', path: ['leakageTargetA'], message: 'Give a leakage target or an allowed error, not both.' });
		if (r.allowedErrorV !== undefined && !(r.sourceResistanceOhm! > 0))
			ctx.addIssue({ code: 'custom', path: ['sourceResistanceOhm'], message: 'An allowed error needs the source resistance it appears across.' });
	});
export type RequirementInput = z.infer<typeof requirementSchema>;

const optionalEmail = z.preprocess((v) => (v === '' || v === null ? undefined : v), email.optional());

export const createProjectSchema = z
	.object({
		name: z.string().trim().min(1, 'Give the project a name.').max(120, 'Keep the name under 120 characters.'),
		description: z.string().trim().max(4000, 'Keep the description under 4000 characters.').default(''),
		leadEmail: optionalEmail,
		memberEmails: z.array(email).max(50).default([]),
		requirement: requirementSchema
	})
	.strict();
export type CreateProjectInput = z.infer<typeof createProjectSchema>;

export const shortlistAddSchema = z
	.object({
		junctionId: z.number({ message: 'junctionId must be a part id (a number).' }).int().positive().max(MAX_ID, 'No part has that id.'),
		note: z.string().trim().max(1000, 'Keep the note under 1000 characters.').default('')
	})
	.strict();

/** The project screen's add form: a part number as typed (any case), and an optional note. */
export const shortlistAddFormSchema = z.object({
	partNumber: z.string().trim().min(1, 'Type a part number.'),
	note: z.string().trim().max(1000, 'Keep the note under 1000 characters.')
});

/** The project screen's remove button: the part's id, from a hidden field. */
export const shortlistRemoveFormSchema = z.object({
	partId: z.coerce.number({ message: 'No part named.' }).int('No part named.').positive('No part named.').max(MAX_ID, 'No part named.')
});

export const shortlistRemoveSchema = z.object({ junctionId: z.number().int().positive().max(MAX_ID, 'No part has that id.') }).strict();

export const reviewSchema = z
	.object({
		action: z.enum(REVIEW_ACTIONS, { message: `action must be one of ${REVIEW_ACTIONS.join(', ')}.` }),
		comment: z.string().trim().max(4000, 'Keep the comment under 4000 characters.').default(''),
		/** The project version the person looked at; a decision on anything newer is refused. */
		expectedVersion: z.number().int().positive().max(MAX_ID).optional()
	})
	.strict()
	.superRefine((r, ctx) => {
		if ((r.action === 'request-changes' || r.action === 'reject') && r.comment === '')
			ctx.addIssue({ code: 'custom', path: ['comment'], message: 'Say what should change, or why it is declined.' });
	});

/** The requirement form's fields, as typed (SI prefixes and units welcome), read by the engine's parser. */
const requirementFormSchema = z.object({
	bias: quantity('voltage', 'Bias across the junction'),
	tempLo: optionalQuantity('temperature', 'Temperature, cold end'),
	tempHi: optionalQuantity('temperature', 'Temperature, hot end'),
	clamp: optionalQuantity('current', 'Clamp current'),
	maxDrop: optionalQuantity('voltage', 'Forward-drop limit'),
	leakageTarget: optionalQuantity('current', 'Leakage target'),
	allowedError: optionalQuantity('voltage', 'Allowed error'),
	sourceR: optionalQuantity('resistance', 'Source resistance')
});
export type RequirementField = keyof z.input<typeof requirementFormSchema>;
export const REQUIREMENT_FIELDS = Object.keys(requirementFormSchema.shape) as RequirementField[];
export type RequirementForm = Record<RequirementField, string>;

/** Where each stored value is typed on the form. */
const FIELD_OF: Partial<Record<keyof RequirementInput, RequirementField>> = {
	biasV: 'bias',
	temperatureC: 'tempLo',
	temperatureRangeC: 'tempLo',
	clampCurrentA: 'clamp',
	maxForwardDropV: 'maxDrop',
	leakageTargetA: 'leakageTarget',
	allowedErrorV: 'allowedError',
	sourceResistanceOhm: 'sourceR'
};

/**
 * Reads the typed requirement (`-5 V`, `85 °C`, `10p`) into API units. One temperature
 * alone is a single point; both make a range. Errors are keyed by form field.
 */
export function requirementFromForm(v: RequirementForm): { requirement?: RequirementInput; errors: Record<string, string> } {
	const errors: Record<string, string> = {};
	if (!(v.tempLo ?? '').trim() && !(v.tempHi ?? '').trim()) errors.tempLo = 'Give at least one temperature.';
	const typed = requirementFormSchema.safeParse(v);
	if (!typed.success) for (const i of typed.error.issues) errors[String(i.path[0] ?? 'form')] ??= i.message;
	if (!typed.success || Object.keys(errors).length) return { errors };
	const t = typed.data;
	const out = {
		biasV: t.bias,
		...(t.tempLo !== undefined && t.tempHi !== undefined ? { temperatureRangeC: [t.tempLo, t.tempHi] } : { temperatureC: t.tempLo ?? t.tempHi }),
		clampCurrentA: t.clamp,
		maxForwardDropV: t.maxDrop,
		leakageTargetA: t.leakageTarget,
		allowedErrorV: t.allowedError,
		sourceResistanceOhm: t.sourceR
	};
	const parsed = requirementSchema.safeParse(Object.fromEntries(Object.entries(out).filter(([, x]) => x !== undefined)));
	if (!parsed.success) {
		for (const i of parsed.error.issues) {
			const key = String(i.path[0]) as keyof RequirementInput;
			const field = key === 'temperatureRangeC' && i.path[1] === 1 ? 'tempHi' : (FIELD_OF[key] ?? 'form');
			errors[field] ??= i.message;
		}
		return { errors };
	}
	return { requirement: parsed.data, errors };
}

/** The form's fields for a stored requirement (or the ranking's operating point), written exactly. */
export function requirementToForm(r: Partial<RequirementInput>): RequirementForm {
	return {
		bias: quantityText(r.biasV, 'voltage'),
		// One temperature is the hot end: that is where leakage is judged.
		tempLo: quantityText(r.temperatureRangeC?.[0], 'temperature'),
		tempHi: quantityText(r.temperatureRangeC?.[1] ?? r.temperatureC, 'temperature'),
		clamp: quantityText(r.clampCurrentA, 'current'),
		maxDrop: quantityText(r.maxForwardDropV, 'voltage'),
		leakageTarget: quantityText(r.leakageTargetA, 'current'),
		allowedError: quantityText(r.allowedErrorV, 'voltage'),
		sourceR: quantityText(r.sourceResistanceOhm, 'resistance')
	};
}

/** Splits "a@x.test, b@y.test" into addresses; bad ones are reported. */
export function emailList(text: string): { emails: string[]; error?: string } {
	const parts = text
		.split(/[\s,;]+/)
		.map((s) => s.trim())
		.filter(Boolean);
	const bad = parts.filter((p) => !email.safeParse(p).success);
	if (bad.length) return { emails: [], error: `Not an e-mail address: ${bad.join(', ')}` };
	return { emails: parts.map((p) => p.toLowerCase()) };
}
