import type { Config } from 'tailwindcss';

// Tailwind v4 reads the palette and fonts from @theme in src/app.css and finds the class
// names in the sources itself; this file, loaded there with @config, is kept for what the
// theme cannot say in CSS. Nothing needs it yet.
export default {} satisfies Config;
