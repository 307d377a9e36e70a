import { color } from '$lib/palette';

/**
 * Series colours for charts: graphite shades and verdigris, each at least 3:1 on the paper
 * (WCAG 1.4.11), never the caution amber. The mid verdigris is a chart-only tint.
 */
export const SERIES = [color('verdigris'), color('ink'), '#4a8a7c', color('ink-faint'), color('verdigris-dark'), color('ink-soft'), color('paper-edge')];
export const seriesColor = (i: number) => SERIES[i % SERIES.length];
