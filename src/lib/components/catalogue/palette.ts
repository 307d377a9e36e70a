import { color } from '$lib/palette';

/**
 * Series colours for charts: graphite shades and verdigris, each at least 3:1 on the paper
 * (WCAG 1.4.11), never the caution amber. The mid verdigris is a chart-only tint.
 */
// Greens and greys alternate, and light follows dark, so neighbours in the list stay apart.
export const SERIES = [color('verdigris'), color('ink'), color('paper-edge'), color('verdigris-dark'), color('ink-faint'), '#4a8a7c', color('ink-soft')];
export const seriesColor = (i: number) => SERIES[i % SERIES.length];
