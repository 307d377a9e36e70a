/**
 * The palette as app.css declares it (the `--color-*` variables of its @theme block), and
 * the pairs the screens put together with the WCAG 2.2 contrast each must reach (1.4.3 text,
 * 1.4.11 graphics and control edges). Pure, so the unit spec and scripts/palette-contrast.ts
 * can read the stylesheet themselves.
 */
export type Palette = Record<string, string>;

/** `--color-NAME: #rrggbb;` declarations inside `@theme { … }`, by NAME, with white beside them. */
export function paletteFromCss(text: string): Palette {
	const block = /@theme\s*\{([^}]*)\}/.exec(text)?.[1];
	if (!block) throw new Error('no @theme block in the stylesheet');
	const out: Palette = { white: '#ffffff' };
	for (const m of block.matchAll(/--color-([a-z-]+)\s*:\s*(#[0-9a-f]{6})\s*;/gi)) out[m[1]] = m[2].toLowerCase();
	return out;
}

export type ContrastPair = { fg: string; bg: string; min: number; use: string };

export const TEXT_INKS = ['ink', 'ink-soft', 'ink-faint', 'verdigris', 'verdigris-dark', 'caution', 'danger'];
export const GROUNDS = ['paper', 'paper-deep', 'white', 'verdigris-light', 'caution-light', 'danger-light'];

/** Every pairing the screens use, with the ratio WCAG 2.2 AA asks of it. */
export const CONTRAST_PAIRS: ContrastPair[] = [
	...TEXT_INKS.flatMap((fg) => GROUNDS.map((bg) => ({ fg, bg, min: 4.5, use: 'text' }))),
	{ fg: 'white', bg: 'verdigris', min: 4.5, use: 'button text' },
	{ fg: 'white', bg: 'verdigris-dark', min: 4.5, use: 'button text (hover)' },
	{ fg: 'white', bg: 'danger', min: 4.5, use: 'button text' },
	{ fg: 'paper', bg: 'ink', min: 4.5, use: 'demo band' },
	{ fg: 'verdigris-light', bg: 'ink', min: 4.5, use: 'demo band link (hover)' },
	{ fg: 'paper-edge', bg: 'paper', min: 3, use: 'control edge' },
	{ fg: 'paper-edge', bg: 'white', min: 3, use: 'control edge' },
	{ fg: 'paper-edge', bg: 'paper-deep', min: 3, use: 'decade ticks of the leakage ruler' },
	{ fg: 'verdigris', bg: 'paper', min: 3, use: 'focus ring, chart series' },
	{ fg: 'verdigris', bg: 'paper-deep', min: 3, use: 'focus ring' },
	{ fg: 'ink-faint', bg: 'paper', min: 3, use: 'chart series' },
	{ fg: 'caution', bg: 'paper', min: 3, use: 'operating line on the charts, budget line on the ruler' }
];

