/** How the sentence shows each value once typed (SI prefixes, Unicode minus). */
import { formatBias, formatSI, formatTemperature } from '$lib/junction';
import type { FieldName } from './operating-point-url';

/** Display text for a parsed field value, or null to leave the typed text alone. */
export function displayValue(field: FieldName, value: number): string | null {
	switch (field) {
		case 'bias':
			return formatBias(value);
		case 'tLo':
		case 'tHi':
			return formatTemperature(value);
		case 'clamp':
		case 'leakage':
			return formatSI(value, 'A');
		case 'maxDrop':
			return `${value.toFixed(Math.max(2, Math.min(4, -Math.floor(Math.log10(value)) + 2)))} V`;
		case 'margin':
		case 'allowedError':
			return formatSI(value, 'V');
		case 'source':
			return formatSI(value, 'Ω');
		case 'maxCap':
			return formatSI(value, 'F');
		default:
			return null;
	}
}

/** A current with its prefix, or a dash. */
export function amps(a: number | null | undefined): string {
	return a === null || a === undefined || !Number.isFinite(a) ? '—' : formatSI(a, 'A');
}

export function volts(v: number | null | undefined, digits = 3): string {
	return v === null || v === undefined || !Number.isFinite(v) ? '—' : formatSI(v, 'V', { digits });
}

export function farads(f: number | null | undefined): string {
	return f === null || f === undefined || !Number.isFinite(f) ? '—' : formatSI(f, 'F');
}
