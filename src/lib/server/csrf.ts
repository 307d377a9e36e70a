/**
 * Cross-site request forgery check for form-encoded writes. Same rule as SvelteKit's own
 * origin check, with one difference: a request that proves itself with an
 * `Authorization: Bearer` token is exempt, because a browser never attaches that header on
 * its own — so bench software can upload multipart files without an Origin header, while a
 * cookie-carrying form post from another site is still refused.
 */
const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];
const WRITES = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

export function isCrossSiteFormWrite(request: Request, origin: string): boolean {
	if (!WRITES.has(request.method)) return false;
	const type = (request.headers.get('content-type') ?? '').split(';', 1)[0].trim().toLowerCase();
	if (!FORM_TYPES.includes(type)) return false;
	if (/^Bearer\s+\S+/i.test(request.headers.get('authorization') ?? '')) return false;
	return request.headers.get('origin') !== origin;
}
