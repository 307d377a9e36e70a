/**
 * Pieces for line charts that are redrawn on every animation frame (the ranking screen's
 * curves while a slider moves). Chart.js resolves the options of every point on its own as
 * soon as one point option is a function or an array, which costs far more than drawing;
 * with plain options it resolves them once per dataset. So the lines carry no point
 * options of their own, the occasional marker shape is drawn here, and the operating line
 * is an element over the canvas that moves without the chart being drawn again. A log axis
 * keeps only its decades as ticks (the only ones it names; its grid lines are at them too),
 * instead of laying out and sizing nine ticks a decade at every draw.
 */
import { defaults, type Chart, type Plugin, type PointStyle } from 'chart.js';
import { drawPoint } from 'chart.js/helpers';
import { isDecade } from './decade-ticks';

/**
 * Draws each line's point style at every `every`-th point (from `offset`), so lines differ
 * by more than colour and dash; the points themselves stay at radius 0.
 */
export function seriesMarks(every: number, offset: number, radius = 3): Plugin<'line'> {
	return {
		id: 'seriesMarks',
		afterDatasetsDraw(chart) {
			const { ctx, chartArea } = chart;
			ctx.save();
			chart.data.datasets.forEach((ds, k) => {
				if (!chart.isDatasetVisible(k)) return;
				const meta = chart.getDatasetMeta(k);
				// As Chart.js draws a point: outlined in the line's colour, filled with the dataset's background.
				ctx.strokeStyle = String(ds.borderColor ?? defaults.borderColor);
				ctx.fillStyle = String(ds.backgroundColor ?? defaults.backgroundColor);
				ctx.lineWidth = 1;
				ctx.setLineDash([]);
				const style = (ds.pointStyle ?? 'circle') as PointStyle;
				for (let i = offset; i < meta.data.length; i += every) {
					const { x, y } = meta.data[i];
					if (x < chartArea.left || x > chartArea.right || y < chartArea.top || y > chartArea.bottom) continue;
					drawPoint(ctx, { pointStyle: style, radius, borderWidth: 1 }, x, y);
				}
			});
			ctx.restore();
		}
	};
}

/** Where the operating line sits (in the scale's units) and the words beside it. */
export type OperatingLine = { x: number; text: string };

/**
 * Places an element (a line with a label as its first child) over the chart's canvas at
 * `at.x`, hidden when outside the plot area. Moving it is a style change, not a redraw.
 */
export function placeOperatingLine(chart: Chart, el: HTMLElement, at: OperatingLine): void {
	const { chartArea, scales } = chart;
	const x = scales.x?.getPixelForValue(at.x);
	const inside = x !== undefined && Number.isFinite(x) && x >= chartArea.left && x <= chartArea.right;
	el.hidden = !inside;
	if (!inside) return;
	el.style.transform = `translate(${x.toFixed(1)}px, ${chartArea.top.toFixed(1)}px)`;
	el.style.height = `${(chartArea.bottom - chartArea.top).toFixed(1)}px`;
	const label = el.firstElementChild as HTMLElement | null;
	if (label) {
		if (label.textContent !== at.text) label.textContent = at.text;
		// The words sit right of the line, or left of the plot's right edge when the line is near it.
		label.style.transform = `translateX(${Math.min(4, chartArea.right - 70 - x).toFixed(1)}px)`;
	}
}

/** Keeps an operating line in place when the chart lays itself out again (a resize, new axes). */
export function operatingLinePlugin(el: () => HTMLElement | undefined, at: OperatingLine): Plugin<'line'> {
	return {
		id: 'operatingLine',
		afterLayout(chart) {
			const node = el();
			if (node) placeOperatingLine(chart, node, at);
		}
	};
}

/** For a log axis's afterBuildTicks: the decades only (ticks between them carry no label). */
export function keepDecadeTicks(axis: { ticks: { value: number }[] }): void {
	axis.ticks = axis.ticks.filter((t) => isDecade(t.value));
}
