/**
 * Dates as people read them: one format, made by Intl.DateTimeFormat (ECMA-402) in the
 * reader's locale and time zone, used by every screen through `formatWhen`. Files and the
 * API carry ISO 8601 (`Date.prototype.toISOString`) instead.
 *
 * The server renders with the locale of the request's Accept-Language and the time zone the
 * browser reported in the `tz` cookie (UTC until it has); the browser then formats with its
 * own settings, so a reader sees their own clock either way.
 */

/** Who reads the date: a BCP 47 locale tag and an IANA time zone name. */
export type Reader = { locale: string; timeZone: string };

export const FALLBACK_READER: Reader = { locale: 'en-GB', timeZone: 'UTC' };

/** The cookie the browser writes its IANA time zone into. */
export const TIME_ZONE_COOKIE = 'tz';

/** Day, abbreviated month, year, and the time to the minute: "2 Dec 2026, 07:28" (en-GB). */
const STYLE: Intl.DateTimeFormatOptions = { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit' };

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(reader: Reader, options: Intl.DateTimeFormatOptions = STYLE): Intl.DateTimeFormat {
	const key = `${reader.locale}|${reader.timeZone}|${JSON.stringify(options)}`;
	let f = formatters.get(key);
	if (!f) {
		f = new Intl.DateTimeFormat(reader.locale, { ...options, timeZone: reader.timeZone });
		formatters.set(key, f);
	}
	return f;
}

/** The one way a date is written for a person. */
export function formatWhen(at: Date | string | number, reader: Reader = FALLBACK_READER): string {
	const date = at instanceof Date ? at : new Date(at);
	if (Number.isNaN(date.getTime())) return '—';
	return formatter(reader).format(date);
}

/** Day, abbreviated month and year: "2 Mar 2027" (en-GB). */
const DAY_STYLE: Intl.DateTimeFormatOptions = { year: 'numeric', month: 'short', day: 'numeric' };

/**
 * The calendar day that ends at an instant (a deadline set as "the end of that day", as
 * `endOfDay` makes it), written for a person: "2 Mar 2027" rather than "3 Mar 2027, 00:00".
 */
export function formatLastDay(endsAt: Date | string | number, reader: Reader = FALLBACK_READER): string {
	const date = endsAt instanceof Date ? endsAt : new Date(endsAt);
	if (Number.isNaN(date.getTime())) return '—';
	return formatter(reader, DAY_STYLE).format(new Date(date.getTime() - 1));
}

/** A locale tag Intl supports, or null. */
function supportedLocale(tag: string): string | null {
	try {
		return Intl.DateTimeFormat.supportedLocalesOf([tag])[0] ?? null;
	} catch {
		return null;
	}
}

/**
 * The IANA time zone name as given when Intl knows it, else null. (Intl's resolved name
 * can be an older alias, e.g. Asia/Calcutta for Asia/Kolkata; the browser's own name is kept.)
 */
export function knownTimeZone(name: string | null | undefined): string | null {
	if (!name || name.length > 64) return null;
	try {
		new Intl.DateTimeFormat('en', { timeZone: name });
		return name;
	} catch {
		return null;
	}
}

/**
 * The reader of a request: the first supported language of Accept-Language (RFC 9110
 * §12.5.4; quality values are honoured in order of appearance, as browsers send them
 * sorted) and the time zone cookie.
 */
export function readerFromRequest(acceptLanguage: string | null, timeZoneCookie: string | undefined): Reader {
	let locale = FALLBACK_READER.locale;
	for (const part of (acceptLanguage ?? '').split(',')) {
		const tag = part.split(';')[0].trim();
		const found = tag && tag !== '*' ? supportedLocale(tag) : null;
		if (found) {
			locale = found;
			break;
		}
	}
	return { locale, timeZone: knownTimeZone(timeZoneCookie) ?? FALLBACK_READER.timeZone };
}

/** The browser's own locale and time zone (call only in the browser). */
export function browserReader(): Reader {
	const o = new Intl.DateTimeFormat().resolvedOptions();
	return { locale: o.locale, timeZone: o.timeZone };
}

/**
 * Offset of a time zone from UTC at an instant, in minutes (east positive): the zone's wall
 * clock read back through Intl, minus the instant.
 */
export function zoneOffsetMinutes(at: Date, timeZone: string): number {
	const parts = formatter({ locale: 'en-US', timeZone }, {
		hourCycle: 'h23',
		year: 'numeric',
		month: 'numeric',
		day: 'numeric',
		hour: 'numeric',
		minute: 'numeric',
		second: 'numeric'
	}).formatToParts(at);
	const n = (type: string) => Number(parts.find((p) => p.type === type)?.value);
	const wall = Date.UTC(n('year'), n('month') - 1, n('day'), n('hour'), n('minute'), n('second'));
	return Math.round((wall - Math.floor(at.getTime() / 1000) * 1000) / 60_000);
}

/**
 * The instant a calendar day (YYYY-MM-DD) ends in a time zone, i.e. midnight starting the
 * next day on that zone's clock. The offset is taken at the guess and once more at the
 * result, which settles it across a daylight-saving change.
 * @throws RangeError for a text that is not a calendar date.
 */
export function endOfDay(day: string, timeZone: string): Date {
	const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
	const y = Number(m?.[1]);
	const mo = Number(m?.[2]);
	const d = Number(m?.[3]);
	const probe = new Date(Date.UTC(y, mo - 1, d));
	if (!m || probe.getUTCFullYear() !== y || probe.getUTCMonth() !== mo - 1 || probe.getUTCDate() !== d) {
		throw new RangeError(`not a calendar date: ${day}`);
	}
	const midnightUtc = Date.UTC(y, mo - 1, d + 1);
	let at = midnightUtc - zoneOffsetMinutes(new Date(midnightUtc), timeZone) * 60_000;
	at = midnightUtc - zoneOffsetMinutes(new Date(at), timeZone) * 60_000;
	return new Date(at);
}

/** The instant a calendar day (YYYY-MM-DD) begins in a time zone (the end of the day before). */
export function startOfDay(day: string, timeZone: string): Date {
	endOfDay(day, timeZone); // refuses a text that is not a calendar day
	const before = new Date(`${day}T00:00:00Z`);
	before.setUTCDate(before.getUTCDate() - 1);
	return endOfDay(before.toISOString().slice(0, 10), timeZone);
}

/** A calendar day (YYYY-MM-DD) on a zone's clock, `days` after the instant. */
export function dayInZone(at: Date, timeZone: string, days = 0): string {
	const shifted = new Date(at.getTime() + days * 86_400_000 + zoneOffsetMinutes(at, timeZone) * 60_000);
	return shifted.toISOString().slice(0, 10);
}
