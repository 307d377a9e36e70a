/**
 * Median of a list of numbers: the middle value of the sorted list, or the mean of the two
 * middle values for an even count (the usual definition, e.g. NIST/SEMATECH e-Handbook of
 * Statistical Methods, §1.3.5.1). The list is not changed.
 * @throws RangeError for an empty list.
 */
export function median(xs: readonly number[]): number {
	if (xs.length === 0) throw new RangeError('the median of no values is undefined');
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}
