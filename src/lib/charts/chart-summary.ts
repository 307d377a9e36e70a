/**
 * The words and numbers behind a chart, for people who cannot see the canvas (WCAG 1.1.1):
 * a one-paragraph summary of what each series spans, and the points as table rows.
 */
export type ChartPoint = { x: number; y: number };
export type ChartSeries = { label: string; points: ChartPoint[] };
export type Format = (v: number) => string;

const span = (vs: number[]) => [Math.min(...vs), Math.max(...vs)] as const;

/** "3 series over V from 300 mV to 700 mV. U1: 31 points, |I| from 1 nA to 1 mA. …" (at most `most` series named). */
export function chartSummary(series: ChartSeries[], x: { label: string; format: Format }, y: { label: string; format: Format }, most = 8): string {
	const drawn = series.filter((s) => s.points.length > 0);
	if (drawn.length === 0) return 'The chart has nothing to draw.';
	const [x0, x1] = span(drawn.flatMap((s) => s.points.map((p) => p.x)));
	const head = `${drawn.length} series over ${x.label} from ${x.format(x0)} to ${x.format(x1)}.`;
	const named = drawn.slice(0, most).map((s) => {
		const [y0, y1] = span(s.points.map((p) => p.y));
		const n = s.points.length;
		return `${s.label}: ${n} point${n === 1 ? '' : 's'}, ${y.label} from ${y.format(y0)} to ${y.format(y1)}.`;
	});
	const rest = drawn.length > most ? [`And ${drawn.length - most} more, in the table.`] : [];
	return [head, ...named, ...rest].join(' ');
}

/** One row per point, series after series, for a table a keyboard and a screen reader can read. */
export function chartRows(series: ChartSeries[], x: Format, y: Format): { series: string; x: string; y: string }[] {
	return series.flatMap((s) => s.points.map((p) => ({ series: s.label, x: x(p.x), y: y(p.y) })));
}
