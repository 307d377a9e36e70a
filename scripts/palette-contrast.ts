// Prints the palette's contrast ratios as Markdown tables (for DEVELOPERS.md): every text ink
// on every ground, then the other pairs the screens use, each by culori's wcagContrast (the
// WCAG 2.x formula) beside the least it must reach. npx tsx scripts/palette-contrast.ts
import { readFileSync } from 'node:fs';
import { wcagContrast } from 'culori';
import { CONTRAST_PAIRS, GROUNDS, TEXT_INKS, paletteFromCss } from '../src/lib/palette-contrast';

const palette = paletteFromCss(readFileSync(new URL('../src/app.css', import.meta.url), 'utf8'));
const ratio = (fg: string, bg: string) => wcagContrast(palette[fg], palette[bg]).toFixed(2);
const name = (c: string) => `\`${c}\` ${palette[c]}`;

console.log(`| text (needs 4.5) | ${GROUNDS.map(name).join(' | ')} |`);
console.log(`|---|${GROUNDS.map(() => '---:').join('|')}|`);
for (const fg of TEXT_INKS) console.log(`| ${name(fg)} | ${GROUNDS.map((bg) => ratio(fg, bg)).join(' | ')} |`);
console.log('\n| foreground | on | ratio | needs | use |\n|---|---|---:|---:|---|');
for (const p of CONTRAST_PAIRS.filter((p) => p.use !== 'text')) console.log(`| ${name(p.fg)} | ${name(p.bg)} | ${ratio(p.fg, p.bg)} | ${p.min} | ${p.use} |`);
