import { describe, expect, test } from 'vitest';
import { returnPath } from './return-path';

// What a browser does with a Location header is defined by the WHATWG URL Standard
// (url.spec.whatwg.org, "special" schemes treat "\" as "/", tabs and newlines are removed);
// Node's URL implements the same parser, so it serves as the reference for "where would
// the browser go": resolved against our origin, the result must stay on our origin.
const ORIGIN = 'https://junctionary.example';
function landsOn(location: string): string {
	return new URL(location, ORIGIN).origin;
}

describe('returnPath', () => {
	const hostile = [
		'//evil.example',
		'/\\evil.example',
		'\\\\evil.example',
		'/%5Cevil.example',
		'/%5cevil.example',
		'/%2F%2Fevil.example',
		'/%2f/evil.example',
		'%2F%2Fevil.example',
		'https://evil.example/phish',
		'HTTPS://evil.example',
		'javascript:alert(1)',
		' javascript:alert(1)',
		'/\t/evil.example',
		'/\n/evil.example',
		'/%09/evil.example',
		'data:text/html,<script>alert(1)</script>',
		'evil.example',
		''
	];
	for (const raw of hostile) {
		test(`${JSON.stringify(raw)} falls back to the start page`, () => {
			expect(returnPath(raw)).toBe('/');
		});
	}

	test('every hostile address would have left the site unchecked, and stays on it checked', () => {
		const wouldLeave = hostile.filter((raw) => raw && URL.canParse(raw, ORIGIN) && landsOn(raw) !== ORIGIN);
		// The check is not vacuous: most of these really do send a browser elsewhere.
		expect(wouldLeave.length).toBeGreaterThanOrEqual(8);
		for (const raw of hostile) expect(landsOn(returnPath(raw))).toBe(ORIGIN);
	});

	test('paths on the site pass through, query and fragment kept', () => {
		expect(returnPath('/rank?biasV=-5&temperatureC=85')).toBe('/rank?biasV=-5&temperatureC=85');
		expect(returnPath('/projects/12#review')).toBe('/projects/12#review');
		expect(returnPath('/parts/7/edit')).toBe('/parts/7/edit');
		// A percent escape later in the path is a literal character of our own path.
		expect(returnPath('/catalogue?q=a%2Fb')).toBe('/catalogue?q=a%2Fb');
	});

	test('dot segments are resolved the way the browser would', () => {
		expect(returnPath('/a/../admin')).toBe('/admin');
		expect(returnPath('/../../x')).toBe('/x');
	});

	test('missing, absurdly long or malformed input uses the fallback given', () => {
		expect(returnPath(null, '/rank')).toBe('/rank');
		expect(returnPath(undefined)).toBe('/');
		expect(returnPath('/' + 'a'.repeat(3000))).toBe('/');
		expect(returnPath('/%E0%A4%A')).toBe('/');
	});
});
