/**
 * zod fields for quantities: a number in base SI units (°C for temperatures), or text as a
 * person types it ("200 mA", "85 °C"), read by the same function the forms use as you type.
 */
import { z } from 'zod';
import { readQuantity, type FieldKind } from '$lib/quantity';

/**
 * A required quantity; `check` adds the range the field allows (its messages should name
 * the field as the screen labels it).
 */
export function quantity(kind: FieldKind, label: string, check: (n: z.ZodNumber) => z.ZodType<number, number> = (n) => n) {
	return z
		.union([z.number({ message: `${label}: give a number.` }), z.string({ message: `${label}: give a number.` })], {
			message: `${label}: give a number.`
		})
		.transform((v, ctx): number => {
			// zod's number already refuses NaN and ±Infinity.
			if (typeof v === 'number') return v;
			const r = readQuantity(v, kind);
			if (!r) {
				ctx.addIssue({ code: 'custom', message: `${label} is required.` });
				return z.NEVER;
			}
			if (!r.ok) {
				ctx.addIssue({ code: 'custom', message: r.message });
				return z.NEVER;
			}
			return r.value;
		})
		.pipe(check(z.number()));
}

/** The same, left out when absent or empty. */
export function optionalQuantity(kind: FieldKind, label: string, check?: (n: z.ZodNumber) => z.ZodType<number, number>) {
	return z.preprocess((v) => (v === '' || v === null || (typeof v === 'string' && v.trim() === '') ? undefined : v), quantity(kind, label, check).optional());
}
