import { formatTemperature } from '$lib/junction/units';
import { FLAG_WORDS, type RankFlag } from '$lib/schemas/rank';

/** Amps, volts, ohms with SI prefixes; a dash when absent (the catalogue's one formatter). */
export { si } from '$lib/catalogue/format';

export function temperatures(r: { temperatureC?: number; temperatureRangeC?: [number, number] }): string {
	if (r.temperatureRangeC) return `${formatTemperature(r.temperatureRangeC[0])} … ${formatTemperature(r.temperatureRangeC[1])}`;
	return r.temperatureC === undefined ? '—' : formatTemperature(r.temperatureC);
}

/** A flag in words: short label and the full explanation. */
export function flagWords(code: string): { short: string; long: string } {
	const w = FLAG_WORDS[code as RankFlag];
	return w ? { short: w.short, long: w.long } : { short: code, long: code };
}
