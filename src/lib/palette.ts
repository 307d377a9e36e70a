/**
 * The palette as the page has it, read from app.css's text so charts (drawn on canvas, where
 * CSS variables do not reach) use the same values as the classes.
 */
import css from '../app.css?raw';
import { paletteFromCss, type Palette } from './palette-contrast';

export const PALETTE: Palette = paletteFromCss(css);

/** A colour of the palette by name; an unknown name is a programming error. */
export function color(name: string): string {
	const c = PALETTE[name];
	if (!c) throw new Error(`no colour ${name} in the palette`);
	return c;
}

/**
 * Series styles for charts: colour, dash and marker all change from one series to the next,
 * so series are told apart without colour (WCAG 1.4.1) and each line reaches 3:1 on paper.
 */
const SERIES_COLORS = ['verdigris', 'ink', 'verdigris-dark', 'ink-soft', 'ink-faint'];
const SERIES_DASHES: number[][] = [[], [6, 3], [2, 3], [10, 3, 2, 3], [4, 2, 1, 2]];
const SERIES_MARKS = ['circle', 'triangle', 'rect', 'rectRot', 'crossRot'] as const;
export type SeriesStyle = { color: string; dash: number[]; pointStyle: (typeof SERIES_MARKS)[number] };

export function seriesStyle(i: number): SeriesStyle {
	const k = i % SERIES_COLORS.length;
	return { color: color(SERIES_COLORS[k]), dash: SERIES_DASHES[k], pointStyle: SERIES_MARKS[k] };
}
