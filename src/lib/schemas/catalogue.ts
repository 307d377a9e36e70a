import { z } from 'zod';
import { JUNCTION_KINDS, KIND_LABEL, LIFECYCLES, LIFECYCLE_LABEL, MATERIALS, MATERIAL_LABEL } from '$lib/catalogue/vocabulary';
import { optionalQuantity, quantity } from './quantity';

export { fieldErrors } from './people';

const finitePositive = (what: string) =>
	z.number({ message: `${what} must be a number.` }).finite(`${what} must be finite.`).positive(`${what} must be above zero.`);

/** A model given directly (SPICE card values or a datasheet), in SPICE names and SI units. */
const storedModel = z
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

/** Ratings as numbers in V, A and °C, or as typed ("40 V", "200 mA", "150 °C"). */
const ratings = z
	.object({
		reverseV: optionalQuantity('voltage', 'Rated reverse voltage', (n) =>
			n.positive('The rated reverse voltage must be above zero.').max(10_000, 'The rated reverse voltage must be at most 10 kV.')
		),
		forwardA: optionalQuantity('current', 'Rated forward current', (n) =>
			n.positive('The rated forward current must be above zero.').max(1000, 'The rated forward current must be at most 1 kA.')
		),
		junctionC: optionalQuantity('temperature', 'Rated junction temperature', (n) =>
			n.min(-60, 'The rated junction temperature must be −60 °C or more.').max(300, 'The rated junction temperature must be 300 °C or less.')
		)
	})
	.strict();

const listed = (labels: Record<string, string>) => Object.values(labels).join(', ');

/** The fields a part is created with, shared by the new-part form and POST /api/v1/junctions. */
export const partInput = z.object({
	partNumber: z
		.string()
		.trim()
		.min(1, 'Give the part number as the maker prints it.')
		.max(60, 'A part number is at most 60 characters.')
		.regex(/^[\w.+/#-]+(?: [\w.+/#-]+)*$/, 'Letters, digits and . + / # - only.'),
	maker: z.string().trim().min(1, 'Name the maker.').max(80, 'The maker is at most 80 characters.'),
	kind: z.enum(JUNCTION_KINDS, { message: `Choose the kind: ${listed(KIND_LABEL)}.` }),
	package: z.string().trim().max(40, 'The package is at most 40 characters.').default(''),
	material: z.enum(MATERIALS, { message: `Choose the material: ${listed(MATERIAL_LABEL)}, or leave it to the kind.` }).optional(),
	admitsLight: z.boolean().optional(),
	anodePins: z.string().trim().max(20, 'The anode pins are at most 20 characters.').default(''),
	cathodePins: z.string().trim().max(20, 'The cathode pins are at most 20 characters.').default(''),
	ratings: ratings.default({}),
	tags: z.array(tag).max(20, 'At most 20 tags.').default([]),
	notes: z.string().max(4000, 'Keep the notes under 4000 characters.').default(''),
	lifecycle: z.enum(LIFECYCLES, { message: `Choose the lifecycle: ${listed(LIFECYCLE_LABEL)}.` }).default('in-use'),
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
		// As typed: the schema reads "200 mA" with the engine's parser, as the form did while typing.
		ratings: { reverseV: values.reverseV, forwardA: values.forwardA, junctionC: values.junctionC },
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

/** Measurement temperature as typed ("25", "85 °C", "298.15 K") or a number in °C; −70 … +200 °C. */
export const temperatureC = quantity('temperature', 'Temperature', (n) =>
	n
		.min(-70, 'Temperatures are in °C; below −70 °C is outside any bench here.')
		.max(200, 'Temperatures are in °C; above 200 °C looks like kelvin (25 °C = 298.15 K).')
);

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

/** A bias window left out of a fit, as numbers in volts or as typed ("0.65", "650 mV"). */
export const excludeRange = z
	.object({ fromV: quantity('voltage', 'Leave out from'), toV: quantity('voltage', 'Leave out to') })
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
