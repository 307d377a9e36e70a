import { formatSI, formatTemperature } from '$lib/junction';

/** A quantity with SI prefix, or an em dash when unknown. */
export function si(value: number | null | undefined, unit: string, digits = 3): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	return formatSI(value, unit, { digits });
}

export function plain(value: number | null | undefined, digits = 3): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	return Number(value.toPrecision(digits)).toString().replace('-', '−');
}

export function celsius(value: number | null | undefined): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '—';
	return formatTemperature(value);
}

export function interval(iv: [number, number] | undefined, unit: string, digits = 3): string {
	if (!iv) return '—';
	if (unit) return `${si(iv[0], unit, digits)} … ${si(iv[1], unit, digits)}`;
	return `${plain(iv[0], digits + 1)} … ${plain(iv[1], digits + 1)}`;
}

/** A fraction as a percentage: 0.0042 → "0.42 %". */
export function percent(fraction: number | null | undefined, digits = 2): string {
	if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—';
	return `${plain(100 * fraction, digits)} %`;
}
