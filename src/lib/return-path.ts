/**
 * Where a person may be sent after signing in: only a path on this site. Anything that a
 * browser could read as another origin — `//host`, `/\host` (browsers treat `\` as `/`),
 * the same written with percent escapes (`/%5Chost`, `/%2F%2Fhost`), an absolute URL, a
 * `javascript:` address, control characters — falls back to the start page.
 *
 * The candidate is resolved by the WHATWG URL parser (the one browsers use) against a base
 * that cannot be a real host; it must keep that origin, and the path it resolves to is
 * returned in its normalised form, so what is redirected to is what was checked.
 */
const BASE = 'http://return-path.invalid';

/** Characters a URL parser strips (tab, newline …) or rewrites (backslash) as it reads. */
const CONTROL = /[\u0000-\u001f\u007f]/g;
const UNSAFE = /[\u0000-\u001f\u007f\\]/;

export function returnPath(raw: string | null | undefined, fallback = '/'): string {
	if (typeof raw !== 'string' || raw.length === 0 || raw.length > 2000) return fallback;
	if (!raw.startsWith('/') || UNSAFE.test(raw)) return fallback;
	// Percent escapes of "/" or "\" at the start would turn into "//" if anything decoded
	// the path once more (a proxy, a framework, a log viewer): refuse them outright.
	let decoded: string;
	try {
		decoded = decodeURIComponent(raw);
	} catch {
		return fallback;
	}
	if (/^[/\\]{2}/.test(decoded.replace(CONTROL, ''))) return fallback;
	let url: URL;
	try {
		url = new URL(raw, BASE);
	} catch {
		return fallback;
	}
	if (url.origin !== BASE) return fallback;
	return url.pathname + url.search + url.hash;
}
