import { z } from 'zod';
import { parseCurrent, parseResistance, parseTemperature, parseVoltage } from '$lib/junction/units';
import { REVIEW_ACTIONS } from '$lib/review-transitions';
import { email } from './people';
import { MAX_ID } from '../../params/id';
import { nodeRequirementSchema } from './node';

const finite = (what: string) => z.number({ message: `${what} must be a number.` }).refine(Number.isFinite, `${what} must be finite.`);
const celsius = (what: string) => finite(what).min(-273.15, `${what} is below absolute zero.`).max(500, `${what} is above 500 °C.`);

/** The requirement as stored and as the API takes it: volts, amperes, ohms, °C. */
export const requirementSchema = z
	.object({
		biasV: finite('biasV').min(-10_000, 'biasV is beyond −10 kV.').max(100, 'biasV is beyond 100 V forward.'),
		temperatureC: celsius('temperatureC').optional(),
		temperatureRangeC: z.tuple([celsius('temperatureRangeC[0]'), celsius('temperatureRangeC[1]')]).optional(),
		clampCurrentA: finite('clampCurrentA').positive('clampCurrentA must be above zero.').max(1000).optional(),
		maxForwardDropV: finite('maxForwardDropV').positive('maxForwardDropV must be above zero.').max(100).optional(),
		leakageTargetA: finite('leakageTargetA').positive('leakageTargetA must be above zero.').max(1).optional(),
		sourceResistanceOhm: finite('sourceResistanceOhm').min(0, 'sourceResistanceOhm cannot be negative.').optional(),
		/** A protected node the shortlist is judged in; candidate positions take each listed part. */
		node: nodeRequirementSchema.optional()
	})
	.strict()
	.superRefine((r, ctx) => {
		if (r.temperatureC === undefined && r.temperatureRangeC === undefined)
			ctx.addIssue({ code: 'custom', path: ['temperatureC'], message: 'Give temperatureC or temperatureRangeC [lo, hi].' });
		if (r.temperatureC !== undefined && r.temperatureRangeC !== undefined)
			ctx.addIssue({ code: 'custom', path: ['temperatureRangeC'], message: 'Give temperatureC or temperatureRangeC, not both.' });
		if (r.temperatureRangeC && r.temperatureRangeC[0] > r.temperatureRangeC[1])
			ctx.addIssue({ code: 'custom', path: ['temperatureRangeC'], message: 'The cold end must not be above the hot end.' });
		if (r.maxForwardDropV !== undefined && r.clampCurrentA === undefined)
			ctx.addIssue({ code: 'custom', path: ['clampCurrentA'], message: 'A forward-drop limit needs the clamp current it applies at.' });
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

/** Form fields of the requirement, as typed (SI prefixes and units welcome). */
export const REQUIREMENT_FIELDS = ['bias', 'tempLo', 'tempHi', 'clamp', 'maxDrop', 'leakageTarget', 'sourceR'] as const;
export type RequirementField = (typeof REQUIREMENT_FIELDS)[number];
export type RequirementForm = Record<RequirementField, string>;

/**
 * Reads the typed requirement (`-5 V`, `85 °C`, `10p`) into API units. One temperature
 * alone is a single point; both make a range. Errors are keyed by form field.
 */
export function requirementFromForm(v: RequirementForm): { requirement?: RequirementInput; errors: Record<string, string> } {
	const errors: Record<string, string> = {};
	const out: Record<string, unknown> = {};
	const read = (field: RequirementField, parse: (s: string) => number, key: string, required = false) => {
		const text = (v[field] ?? '').trim();
		if (!text) {
			if (required) errors[field] = 'Required.';
			return undefined;
		}
		try {
			const value = parse(text);
			out[key] = value;
			return value;
		} catch (e) {
			errors[field] = e instanceof Error ? e.message.replace(/^expected/, 'Expected') : 'Not understood.';
			return undefined;
		}
	};
	read('bias', parseVoltage, 'biasV', true);
	const lo = read('tempLo', (s) => parseTemperature(s).celsius, '_lo');
	const hi = read('tempHi', (s) => parseTemperature(s).celsius, '_hi');
	delete out._lo;
	delete out._hi;
	if (lo !== undefined && hi !== undefined) out.temperatureRangeC = [lo, hi];
	else if (lo !== undefined || hi !== undefined) out.temperatureC = lo ?? hi;
	else if (!errors.tempLo && !errors.tempHi) errors.tempLo = 'Give at least one temperature.';
	read('clamp', parseCurrent, 'clampCurrentA');
	read('maxDrop', parseVoltage, 'maxForwardDropV');
	read('leakageTarget', parseCurrent, 'leakageTargetA');
	read('sourceR', parseResistance, 'sourceResistanceOhm');
	if (Object.keys(errors).length) return { errors };
	const parsed = requirementSchema.safeParse(out);
	if (!parsed.success) {
		const fieldOf: Record<string, RequirementField> = {
			biasV: 'bias',
			temperatureC: 'tempLo',
			temperatureRangeC: 'tempLo',
			clampCurrentA: 'clamp',
			maxForwardDropV: 'maxDrop',
			leakageTargetA: 'leakageTarget',
			sourceResistanceOhm: 'sourceR'
		};
		for (const i of parsed.error.issues) errors[fieldOf[String(i.path[0])] ?? 'form'] ??= i.message;
		return { errors };
	}
	return { requirement: parsed.data, errors };
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
