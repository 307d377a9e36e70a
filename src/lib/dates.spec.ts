import { describe, expect, test } from 'vitest';
import { dayInZone, endOfDay, formatLastDay, formatWhen, knownTimeZone, readerFromRequest, startOfDay, zoneOffsetMinutes } from './dates';

const AT = new Date('2026-12-02T06:28:00Z');

describe('a date as a person reads it', () => {
	// Expected texts are CLDR's medium date patterns with a 24 h or 12 h clock as each locale
	// uses it (Unicode CLDR, as shipped in Node's ICU); the wall clocks follow the IANA tz database.
	test.each([
		['en-GB', 'Europe/London', '2 Dec 2026, 06:28'],
		['de-DE', 'Europe/Berlin', '2. Dez. 2026, 07:28'],
		['en-US', 'America/New_York', 'Dec 2, 2026, 01:28 AM'],
		['ja-JP', 'Asia/Tokyo', '2026年12月2日 15:28']
	])('%s on %s clock', (locale, timeZone, expected) => {
		expect(formatWhen(AT, { locale, timeZone })).toBe(expected);
	});

	test('strings and epoch numbers are read as instants; nonsense is a dash', () => {
		expect(formatWhen(AT.toISOString())).toBe('2 Dec 2026, 06:28');
		expect(formatWhen(AT.getTime())).toBe('2 Dec 2026, 06:28');
		expect(formatWhen('not a date')).toBe('—');
	});
});

describe('the reader of a request', () => {
	test('takes the first supported language and a known time zone', () => {
		expect(readerFromRequest('de-DE,de;q=0.9,en;q=0.8', 'Europe/Berlin')).toEqual({ locale: 'de-DE', timeZone: 'Europe/Berlin' });
		expect(readerFromRequest('*, fr-CA;q=0.5', undefined)).toEqual({ locale: 'fr-CA', timeZone: 'UTC' });
	});
	test('falls back to en-GB and UTC for what it cannot use', () => {
		expect(readerFromRequest(null, 'Mars/Olympus_Mons')).toEqual({ locale: 'en-GB', timeZone: 'UTC' });
		expect(readerFromRequest('!!,;q=1', 'x'.repeat(80))).toEqual({ locale: 'en-GB', timeZone: 'UTC' });
		expect(knownTimeZone('Asia/Kolkata')).toBe('Asia/Kolkata');
		expect(knownTimeZone('')).toBeNull();
	});
});

describe('calendar days on a zone clock', () => {
	// Offsets from the IANA tz database: India +5:30 all year; EU summer time from 01:00 UTC
	// on the last Sunday of March to the last Sunday of October (Directive 2000/84/EC);
	// US daylight time ends on the first Sunday of November at 02:00 local (Energy Policy Act 2005).
	test('offsets east positive, with half hours and summer time', () => {
		expect(zoneOffsetMinutes(new Date('2026-06-15T12:00:00Z'), 'Asia/Kolkata')).toBe(330);
		expect(zoneOffsetMinutes(new Date('2026-03-29T00:59:00Z'), 'Europe/Berlin')).toBe(60);
		expect(zoneOffsetMinutes(new Date('2026-03-29T01:00:00Z'), 'Europe/Berlin')).toBe(120);
		expect(zoneOffsetMinutes(new Date('2026-07-01T12:00:00Z'), 'America/New_York')).toBe(-240);
		expect(zoneOffsetMinutes(new Date('2026-12-01T12:00:00Z'), 'UTC')).toBe(0);
	});

	test.each([
		['2026-06-15', 'Asia/Kolkata', '2026-06-15T18:30:00.000Z'],
		// The day before summer time starts ends on winter time, the day it starts on summer time.
		['2026-03-28', 'Europe/Berlin', '2026-03-28T23:00:00.000Z'],
		['2026-03-29', 'Europe/Berlin', '2026-03-29T22:00:00.000Z'],
		// 1 November 2026 is 25 hours long in New York.
		['2026-10-31', 'America/New_York', '2026-11-01T04:00:00.000Z'],
		['2026-11-01', 'America/New_York', '2026-11-02T05:00:00.000Z'],
		['2028-02-29', 'UTC', '2028-03-01T00:00:00.000Z']
	])('%s ends in %s at %s', (day, zone, iso) => {
		expect(endOfDay(day, zone).toISOString()).toBe(iso);
	});

	test('a day starts where the one before ends', () => {
		expect(startOfDay('2026-11-01', 'America/New_York').toISOString()).toBe('2026-11-01T04:00:00.000Z');
		expect(endOfDay('2026-11-01', 'America/New_York').getTime() - startOfDay('2026-11-01', 'America/New_York').getTime()).toBe(25 * 3600_000);
		expect(startOfDay('2026-01-01', 'UTC').toISOString()).toBe('2026-01-01T00:00:00.000Z');
	});

	test('a text that is not a calendar day is refused', () => {
		for (const bad of ['2026-02-30', '2026-13-01', '26-01-01', 'tomorrow']) expect(() => endOfDay(bad, 'UTC')).toThrow(RangeError);
		expect(() => startOfDay('2026-02-30', 'UTC')).toThrow(RangeError);
	});

	test('the day on a zone clock, and days ahead of it', () => {
		const lateUtc = new Date('2026-12-31T23:30:00Z');
		expect(dayInZone(lateUtc, 'UTC')).toBe('2026-12-31');
		expect(dayInZone(lateUtc, 'Europe/Berlin')).toBe('2027-01-01');
		expect(dayInZone(lateUtc, 'America/New_York')).toBe('2026-12-31');
		expect(dayInZone(lateUtc, 'UTC', 90)).toBe('2027-03-31');
	});
});

describe('the last day of a deadline', () => {
	// Expected texts from Intl.DateTimeFormat itself (ECMA-402), the reference formatter.
	test('names the day that ends at the instant, on the reader\'s clock', () => {
		const reader = { locale: 'en-GB', timeZone: 'Europe/Berlin' };
		const ends = endOfDay('2027-03-02', reader.timeZone);
		const want = new Intl.DateTimeFormat('en-GB', { year: 'numeric', month: 'short', day: 'numeric', timeZone: 'UTC' }).format(new Date(Date.UTC(2027, 2, 2)));
		expect(formatLastDay(ends, reader)).toBe(want);
		expect(formatLastDay(ends, reader)).not.toBe(formatLastDay(endOfDay('2027-03-03', reader.timeZone), reader));
		expect(formatLastDay('not a date')).toBe('—');
	});
});
