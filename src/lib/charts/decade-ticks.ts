import { formatSI } from '$lib/junction/units';

/** Whether v is a whole decade (…, 1 fA, 10 fA, …, 1 A, 10 A): a log axis names only those. */
export function isDecade(v: number): boolean {
	const e = Math.log10(v);
	return Number.isFinite(e) && Math.abs(e - Math.round(e)) < 1e-6;
}

/** A log current axis's tick: the current with its SI prefix at whole decades, blank between them. */
export function decadeAmpsTick(v: number | string): string {
	const n = Number(v);
	return isDecade(n) ? formatSI(n, 'A') : '';
}
