/**
 * The import rules of DEVELOPERS.md ("The floors"), read off the source: the engine names no
 * SvelteKit, server, Node or DOM module, and nothing the browser runs names a server module.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';

function files(dir: string): string[] {
	return readdirSync(dir).flatMap((name) => {
		const path = join(dir, name);
		return statSync(path).isDirectory() ? files(path) : /\.(ts|svelte)$/.test(name) ? [path] : [];
	});
}

const importsOf = (path: string) => [...readFileSync(path, 'utf8').matchAll(/(?:^|\n)\s*import\s[^;]*?from\s+['"]([^'"]+)['"]/g)].map((m) => m[1]);
const isSpec = (p: string) => p.endsWith('.spec.ts');
/** `$lib/server/…`, or a relative path through a `server` folder (`../server/db`). */
const serverModule = (spec: string) => spec.startsWith('$lib/server') || (spec.startsWith('.') && spec.split('/').includes('server'));

describe('floors', () => {
	it('the engine (src/lib/junction) imports only itself and packages that run anywhere', () => {
		const bad = files('src/lib/junction')
			.filter((p) => !isSpec(p))
			.flatMap((p) => importsOf(p).filter((s) => s.startsWith('$') || s.startsWith('node:') || s.startsWith('..')).map((s) => `${p}: ${s}`));
		expect(bad).toEqual([]);
	});

	it('nothing the browser runs names a server module', () => {
		const browser = [
			...files('src/lib').filter((p) => !p.startsWith(join('src', 'lib', 'server')) && !isSpec(p)),
			...files('src/routes').filter((p) => p.endsWith('.svelte') || p.endsWith('.svelte.ts') || (!/\+(page|layout)\.server\.ts$|\+server\.ts$/.test(p) && !isSpec(p) && p.endsWith('.ts')))
		];
		const bad = browser.flatMap((p) => importsOf(p).filter(serverModule).map((s) => `${p}: ${s}`));
		expect(bad).toEqual([]);
	});
});
