import { formatTemperature } from '$lib/junction/units';
import { flagText } from '$lib/schemas/node';


export function temperatures(r: { temperatureC?: number; temperatureRangeC?: [number, number] }): string {
	if (r.temperatureRangeC) return `${formatTemperature(r.temperatureRangeC[0])} … ${formatTemperature(r.temperatureRangeC[1])}`;
	return r.temperatureC === undefined ? '—' : formatTemperature(r.temperatureC);
}

/** A flag in words (the catalogue's or a protected node's): short label and the full explanation. */
export function flagWords(code: string): { short: string; long: string } {
	const w = flagText(code);
	return { short: w.short, long: w.long };
}
