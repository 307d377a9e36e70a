// Headers, cookies and secrets: the things a security review looks at first.
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { APP_URL, cookieFor } from './helpers';

describe('response headers', () => {
	test('pages carry a Content-Security-Policy and the usual protective headers', async () => {
		const res = await fetch(`${APP_URL}/signin`);
		const csp = res.headers.get('content-security-policy') ?? '';
		expect(csp).toContain("default-src 'self'");
		expect(csp).toContain("frame-ancestors 'none'");
		expect(csp).toMatch(/script-src 'self'( 'nonce-[^']+'| 'sha256-[^']+')*/);
		expect(csp).not.toContain("'unsafe-eval'");
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
		expect(res.headers.get('x-frame-options')).toBe('DENY');
		expect(res.headers.get('referrer-policy')).toBe('same-origin');
	});

	test('API answers carry nosniff too', async () => {
		const res = await fetch(`${APP_URL}/api/v1/health`);
		expect(res.headers.get('x-content-type-options')).toBe('nosniff');
	});

	test('a signed-in page does not leak the session token into its HTML', async () => {
		const cookie = await cookieFor('designer');
		const html = await (await fetch(`${APP_URL}/`, { headers: { cookie } })).text();
		expect(html).not.toContain(cookie.split('=')[1]);
	});
});

describe('secrets', () => {
	// Patterns of real secrets; the .env file that holds AUTH_SECRET is git-ignored.
	const SECRET = [/AUTH_SECRET\s*=\s*['"]?[A-Za-z0-9_\-+/]{16,}/, /-----BEGIN [A-Z ]*PRIVATE KEY-----/, /\bjct_[A-Za-z0-9_-]{40,}\b/];

	test('no file tracked by git holds a secret, and .env is ignored', () => {
		const files = execFileSync('git', ['ls-files'], { encoding: 'utf8' }).split('\n').filter(Boolean);
		expect(files).not.toContain('.env');
		const leaks: string[] = [];
		for (const f of files) {
			if (/\.(png|woff2?|ico)$/.test(f)) continue;
			let text: string;
			try {
				text = readFileSync(f, 'utf8');
			} catch {
				continue;
			}
			for (const re of SECRET) if (re.test(text)) leaks.push(`${f} matches ${re}`);
		}
		expect(leaks).toEqual([]);
		expect(execFileSync('git', ['check-ignore', '.env'], { encoding: 'utf8' }).trim()).toBe('.env');
	});
});
