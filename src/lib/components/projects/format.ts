import { formatSI, formatTemperature } from '$lib/junction/units';
import { flagText } from '$lib/schemas/node';

/** Amps, volts, ohms with SI prefixes; a dash when absent. */
export function si(v: number | null | undefined, unit: string, digits = 3): string {
	return v === null || v === undefined || !Number.isFinite(v) ? '—' : formatSI(v, unit, { digits });
}

export function temperatures(r: { temperatureC?: number; temperatureRangeC?: [number, number] }): string {
	if (r.temperatureRangeC) return `${formatTemperature(r.temperatureRangeC[0])} … ${formatTemperature(r.temperatureRangeC[1])}`;
	return r.temperatureC === undefined ? '—' : formatTemperature(r.temperatureC);
}

/** A flag in words (the catalogue's or a protected node's): short label and the full explanation. */
export function flagWords(code: string): { short: string; long: string } {
	const w = flagText(code);
	return { short: w.short, long: w.long };
}

export function when(d: Date | string): string {
	const date = typeof d === 'string' ? new Date(d) : d;
	return date.toISOString().slice(0, 16).replace('T', ' ') + ' UTC';
}
