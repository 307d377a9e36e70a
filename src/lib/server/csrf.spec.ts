import { describe, expect, test } from 'vitest';
import { isCrossSiteFormWrite } from './csrf';

const ORIGIN = 'http://127.0.0.1:3000';
const req = (method: string, headers: Record<string, string>) => new Request(`${ORIGIN}/x`, { method, headers, body: method === 'GET' ? undefined : 'a=1' });

describe('cross-site form writes', () => {
	const cases: [string, Request, boolean][] = [
		['a form post from another site', req('POST', { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.test' }), true],
		['a multipart post with no origin and no token', req('POST', { 'content-type': 'multipart/form-data; boundary=x' }), true],
		['a text/plain post from another site', req('POST', { 'content-type': 'text/plain', origin: 'http://evil.test' }), true],
		['a form post from our own pages', req('POST', { 'content-type': 'application/x-www-form-urlencoded', origin: ORIGIN }), false],
		['a multipart upload from bench software with a token', req('POST', { 'content-type': 'multipart/form-data; boundary=x', authorization: 'Bearer jct_abc' }), false],
		['a JSON post (browsers cannot send it cross-site without CORS)', req('POST', { 'content-type': 'application/json', origin: 'http://evil.test' }), false],
		['a GET', req('GET', { origin: 'http://evil.test' }), false],
		['a form DELETE from another site', req('DELETE', { 'content-type': 'application/x-www-form-urlencoded', origin: 'http://evil.test' }), true]
	];
	for (const [name, request, refused] of cases) test(`${name} is ${refused ? 'refused' : 'allowed'}`, () => expect(isCrossSiteFormWrite(request, ORIGIN)).toBe(refused));
});
