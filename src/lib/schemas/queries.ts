/** Query strings read by routes that are not the ranking's own (that one is operating-point-url.ts). */
import { z } from 'zod';
import { MATERIALS } from '$lib/catalogue/vocabulary';
import { MAX_ID } from '../../params/id';

/** POST /api/v1/fit?material=…: the junction material the fit assumes (silicon unless said). */
export const fitQuerySchema = z.object({
	material: z.enum(MATERIALS, { message: `material is one of ${MATERIALS.join(', ')}` }).default('silicon')
});

/**
 * The compare screen's ?ids=3,8,21: part ids, duplicates dropped, in the order given. A
 * piece that is not an id is ignored (a hand-edited address still compares the rest); more
 * than `max` is refused.
 */
export function compareIdsSchema(max: number) {
	return z
		.string()
		.default('')
		.transform((raw) => [...new Set(raw.split(',').map((s) => Number(s.trim())))].filter((n) => Number.isInteger(n) && n > 0 && n <= MAX_ID))
		.pipe(z.array(z.number()).max(max, `Compare at most ${max} parts at once.`));
}
