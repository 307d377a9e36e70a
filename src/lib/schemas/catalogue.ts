import { z } from 'zod';
import { JUNCTION_KINDS, LIFECYCLES, MATERIALS } from '$lib/catalogue/vocabulary';

export { fieldErrors } from './people';

const finitePositive = (what: string) =>
	z.number({ message: `${what} must be a number.` }).finite(`${what} must be finite.`).positive(`${what} must be above zero.`);

/** A model given directly (SPICE card values or a datasheet), in SPICE names and SI units. */
export const storedModel = z
	.object({
		IS: finitePositive('IS'),
		N: finitePositive('N').max(10, 'N above 10 is not a junction emission coefficient.').optional(),
		RS: z.number().finite().min(0, 'RS cannot be negative.').optional(),
		RSH: finitePositive('RSH').optional(),
		ISR: z.number().finite().min(0).optional(),
		NR: finitePositive('NR').optional(),
		BV: finitePositive('BV').optional(),
		IBV: finitePositive('IBV').optional(),
		EG: finitePositive('EG').max(6).optional(),
		XTI: z.number().finite().optional(),
		TNOM: z.number().finite().min(-100).max(250).optional(),
		CJO: z.number().finite().min(0).optional(),
		VJ: finitePositive('VJ').optional(),
		M: z.number().finite().min(0).max(1).optional(),
		FC: z.number().finite().min(0).lt(1).optional()
	})
	.strict()
	.transform((m) => ({ ...m, N: m.N ?? 1 }));

const tag = z.string().trim().min(1).max(40, 'A tag is at most 40 characters.');

const ratings = z
	.object({
		reverseV: finitePositive('Rated reverse voltage').max(10_000, 'Rated reverse voltage is at most 10 kV.').optional(),
		forwardA: finitePositive('Rated forward current').max(1000, 'Rated forward current is at most 1 kA.').optional(),
		junctionC: z.number().finite().min(-60, 'Rated junction temperature is in °C (−60 to 300).').max(300, 'Rated junction temperature is in °C (−60 to 300).').optional()
	})
	.strict();

/** The fields a part is created with, shared by the new-part form and POST /api/v1/junctions. */
export const partInput = z.object({
	partNumber: z
		.string()
		.trim()
		.min(1, 'Give the part number as the maker prints it.')
		.max(60, 'A part number is at most 60 characters.')
		.regex(/^[\w.+/#-]+(?: [\w.+/#-]+)*$/, 'Letters, digits and . + / # - only.'),
	maker: z.string().trim().min(1, 'Name the maker.').max(80),
	kind: z.enum(JUNCTION_KINDS, { message: `Kind is one of ${JUNCTION_KINDS.join(', ')}.` }),
	package: z.string().trim().max(40).default(''),
	material: z.enum(MATERIALS, { message: `Material is one of ${MATERIALS.join(', ')}.` }).optional(),
	admitsLight: z.boolean().optional(),
	anodePins: z.string().trim().max(20).default(''),
	cathodePins: z.string().trim().max(20).default(''),
	ratings: ratings.default({}),
	tags: z.array(tag).max(20).default([]),
	notes: z.string().max(4000).default(''),
	lifecycle: z.enum(LIFECYCLES).default('in-use'),
	model: storedModel.optional(),
	modelSource: z.string().trim().max(200).optional()
});
export type PartInput = z.infer<typeof partInput>;

/** A partial update (PATCH); `model: null` removes a given model. */
export const partPatch = partInput
	.omit({ model: true })
	.partial()
	.extend({ model: storedModel.nullable().optional() })
	.refine((p) => Object.keys(p).length > 0, 'Send at least one field to change.');
export type PartPatch = z.infer<typeof partPatch>;

/** Form fields arrive as strings; this turns them into the partInput shape first. */
export function partFromForm(form: FormData) {
	const s = (k: string) => String(form.get(k) ?? '').trim();
	const num = (k: string) => (s(k) === '' ? undefined : Number(s(k).replace(/\s/g, '')));
	const values = {
		partNumber: s('partNumber'),
		maker: s('maker'),
		kind: s('kind'),
		package: s('package'),
		material: s('material') || undefined,
		admitsLight: form.get('admitsLight') === 'on',
		anodePins: s('anodePins'),
		cathodePins: s('cathodePins'),
		reverseV: s('reverseV'),
		forwardA: s('forwardA'),
		junctionC: s('junctionC'),
		tags: s('tags'),
		notes: String(form.get('notes') ?? ''),
		lifecycle: s('lifecycle') || 'in-use'
	};
	const candidate = {
		partNumber: values.partNumber,
		maker: values.maker,
		kind: values.kind,
		package: values.package,
		material: values.material,
		admitsLight: values.admitsLight,
		anodePins: values.anodePins,
		cathodePins: values.cathodePins,
		ratings: { reverseV: num('reverseV'), forwardA: num('forwardA'), junctionC: num('junctionC') },
		tags: values.tags
			.split(',')
			.map((t) => t.trim())
			.filter(Boolean),
		notes: values.notes,
		lifecycle: values.lifecycle
	};
	return { values, candidate };
}

/** Field errors for part forms, with ratings flattened to their input names. */
export function partFormErrors(e: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of e.issues) {
		const key = issue.path[0] === 'ratings' ? String(issue.path[1] ?? 'ratings') : String(issue.path[0] ?? 'form');
		out[key] ??= issue.message;
	}
	return out;
}

export const sampleInput = z.object({
	unit: z
		.string()
		.trim()
		.min(1, 'Label the unit as it is marked on the bench, e.g. U1.')
		.max(40)
		.regex(/^[\w.#/-]+$/, 'Letters, digits and . # / - only, no spaces.'),
	lot: z.string().trim().max(40).default(''),
	dateCode: z.string().trim().max(20).default('')
});

/** Measurement temperature as typed: °C on a bench, −70 … +200. */
export const temperatureC = z.coerce
	.number({ message: 'Temperature must be a number in °C.' })
	.finite('Temperature must be a finite number in °C.')
	.min(-70, 'Temperatures are in °C; below −70 °C is outside any bench here.')
	.max(200, 'Temperatures are in °C; above 200 °C looks like kelvin (25 °C = 298.15 K).');

export const pointsInput = z.object({
	sample: sampleInput.shape.unit,
	temperatureC,
	fileName: z.string().trim().min(1).max(200).optional(),
	direction: z.enum(['forward', 'reverse', 'both']).optional(),
	points: z
		.array(z.object({ voltageV: z.number().finite(), currentA: z.number().finite() }).strict(), {
			message: 'points must be a list of { voltageV, currentA }.'
		})
		.min(1, 'Send at least one point.')
		.max(100_000, 'At most 100 000 points.')
});

export const fitInput = z.object({
	temperatureC: temperatureC.default(25),
	points: pointsInput.shape.points
});

export const excludeRange = z
	.object({ fromV: z.coerce.number().finite(), toV: z.coerce.number().finite() })
	.refine((r) => r.fromV < r.toV, { message: 'The excluded range must start below where it ends.', path: ['toV'] });

export const catalogueQuery = z.object({
	q: z.string().trim().max(100).default(''),
	kind: z.enum(JUNCTION_KINDS).optional(),
	limit: z.coerce.number().int().min(1).max(500).default(50),
	cursor: z
		.string()
		.regex(/^[1-9]\d{0,9}$/, 'cursor is the nextCursor of a previous page.')
		.optional()
});
