// Every route × every caller: anonymous → 401 or a sign-in redirect, a role without the
// permission → 403, an allowed role → neither, and never a 5xx. The route tree is read from src/routes so a
// new route that nobody lists here fails this suite instead of shipping unguarded.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, test } from 'vitest';
import { ROLES, type Role } from '$lib/permissions';
import { api, browse, type Caller } from './helpers';
import type { RouteCase } from './routes/types';
import { publicRoutes } from './routes/foundation';

const tables = import.meta.glob<Record<string, RouteCase[]>>('./routes/*.ts', { eager: true });
const cases: RouteCase[] = Object.values(tables).flatMap((mod) =>
	Object.values(mod).filter((v): v is RouteCase[] => Array.isArray(v) && typeof v[0] === 'object')
).flat();

function routeTree(dir = 'src/routes'): string[] {
	const found: string[] = [];
	for (const entry of readdirSync(dir)) {
		const full = join(dir, entry);
		if (statSync(full).isDirectory()) found.push(...routeTree(full));
		else if (/^\+(page\.server|page|server)\.(ts|svelte)$/.test(entry)) {
			const id = '/' + relative('src/routes', dir).split('\\').join('/');
			found.push(id === '/' ? '/' : id.replace(/\/$/, ''));
		}
	}
	return [...new Set(found)];
}

/** "route action" for every named action of every +page.server.ts ('default' when unnamed). */
function formActions(dir = 'src/routes'): string[] {
	const found: string[] = [];
	for (const entry of readdirSync(dir)) {
		const full = join(dir, entry);
		if (statSync(full).isDirectory()) found.push(...formActions(full));
		else if (entry === '+page.server.ts') {
			const block = readFileSync(full, 'utf8').match(/export const actions[^=]*=\s*\{([\s\S]*?)\n\};/);
			if (!block) continue;
			const id = '/' + relative('src/routes', dir).split('\\').join('/');
			for (const m of block[1].matchAll(/^\t(\w+): /gm)) found.push(`${id === '/' ? '/' : id.replace(/\/$/, '')} ${m[1]}`);
		}
	}
	return found;
}

const callers: Caller[] = ['anonymous', 'no-role', ...ROLES];

function allowed(c: RouteCase, who: Caller): boolean {
	if (who === 'anonymous') return false;
	if (c.allow === 'signed-in') return true;
	if (who === 'no-role') return false;
	return c.allow === 'any-role' || c.allow.includes(who as Role);
}

describe('role matrix', () => {
	test('every route in src/routes is listed in the matrix or known to be public', () => {
		const listed = new Set(cases.map((c) => c.route));
		const missing = routeTree().filter((r) => !listed.has(r) && !publicRoutes.some((p) => r === p || r.startsWith(p + '/')));
		expect(missing).toEqual([]);
	});

	test('every form action in src/routes is listed in the matrix', () => {
		const listed = new Set(cases.filter((c) => c.kind === 'action').map((c) => `${c.route} ${c.path.split('?/')[1] ?? 'default'}`));
		const missing = formActions().filter((a) => !listed.has(a) && !publicRoutes.some((p) => a.startsWith(p + ' ')));
		expect(missing).toEqual([]);
	});

	for (const c of cases) {
		for (const who of callers) {
			const expectation = allowed(c, who) ? 'gets through' : who === 'anonymous' ? 'must sign in' : 'is refused';
			test(`${c.method} ${c.path} — ${who} ${expectation}`, async () => {
				let status: number;
				let location: string | null = null;
				if (c.kind === 'api') {
					const r = await api(c.method, c.path, { as: who, json: c.json });
					status = r.status;
				} else {
					const r = await browse(c.path, { as: who, form: c.form ?? (c.method === 'POST' ? {} : undefined) });
					status = r.status;
					location = r.location;
				}
				if (allowed(c, who)) {
					expect(status, `${who} should get through`).not.toBe(401);
					expect(status).not.toBe(403);
					// Getting through to a crash is not getting through.
					expect(status, `${who} got a server error`).toBeLessThan(500);
					expect(location ?? '').not.toMatch(/^\/signin/);
				} else if (who === 'anonymous') {
					if (c.kind === 'api') expect(status).toBe(401);
					else expect([status, location?.split('?')[0]]).toEqual([303, '/signin']);
				} else {
					expect(status).toBe(403);
				}
			});
		}
	}
});
