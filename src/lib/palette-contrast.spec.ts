// The palette against WCAG 2.2's contrast minimums (1.4.3 text 4.5:1, 1.4.11 graphics and
// control edges 3:1), measured with culori's wcagContrast, the WCAG 2.x relative-luminance
// formula as a general-purpose colour library implements it.
import { readFileSync } from 'node:fs';
import { wcagContrast } from 'culori';
import { describe, expect, it } from 'vitest';
import { CONTRAST_PAIRS, paletteFromCss } from './palette-contrast';

const palette = paletteFromCss(readFileSync(new URL('../app.css', import.meta.url), 'utf8'));

describe('palette contrast', () => {
	it('measures the published extremes as WCAG defines them', () => {
		// Black on white is 21:1 by definition; #767676 on white is 4.54:1, the lightest grey
		// that passes 4.5:1 (WebAIM's contrast checker gives the same).
		expect(wcagContrast('#000000', '#ffffff')).toBeCloseTo(21, 6);
		expect(wcagContrast('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
	});
	it('reads every colour the pairs name from the @theme block', () => {
		for (const p of CONTRAST_PAIRS) {
			expect(palette[p.fg], p.fg).toMatch(/^#[0-9a-f]{6}$/);
			expect(palette[p.bg], p.bg).toMatch(/^#[0-9a-f]{6}$/);
		}
	});
	it.each(CONTRAST_PAIRS)('$fg on $bg reaches $min:1 ($use)', ({ fg, bg, min }) => {
		expect(wcagContrast(palette[fg], palette[bg])).toBeGreaterThanOrEqual(min);
	});
});
