import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import { sql } from 'drizzle-orm';
import { describe, expect, test } from 'vitest';
import { isDatabaseDown } from './api';

async function failureOf(run: () => Promise<unknown>): Promise<unknown> {
	try {
		await run();
	} catch (e) {
		return e;
	}
	throw new Error('expected a failure');
}

describe('isDatabaseDown', () => {
	// Port 1 (tcpmux) has nothing listening on a test machine: a real refused connection.
	test('a refused connection, as postgres.js reports it and as Drizzle wraps it', async () => {
		const client = postgres('postgres://nobody@127.0.0.1:1/none', { connect_timeout: 2, onnotice: () => {} });
		try {
			expect(isDatabaseDown(await failureOf(() => client`select 1`))).toBe(true);
			expect(isDatabaseDown(await failureOf(() => drizzle(client).execute(sql`select 1`)))).toBe(true);
		} finally {
			await client.end({ timeout: 0 });
		}
	});

	test('server going away or not ready (PostgreSQL SQLSTATEs 57P01, 57P03, 08006, 53300)', () => {
		for (const code of ['57P01', '57P03', '08006', '08001', '53300']) expect(isDatabaseDown({ code }), code).toBe(true);
	});

	test('several failed addresses at once (Node’s AggregateError) and deeper causes', () => {
		const refused = Object.assign(new Error('connect ECONNREFUSED ::1:5432'), { code: 'ECONNREFUSED' });
		expect(isDatabaseDown(new AggregateError([refused, refused]))).toBe(true);
		expect(isDatabaseDown(new Error('wrapped', { cause: new Error('again', { cause: { code: 'CONNECT_TIMEOUT' } }) }))).toBe(true);
	});

	test('real query errors are not outages', () => {
		// 23505 unique_violation, 42601 syntax_error, 22P02 invalid_text_representation, 57014 query_canceled
		for (const code of ['23505', '42601', '22P02', '57014']) expect(isDatabaseDown({ code }), code).toBe(false);
		expect(isDatabaseDown(new TypeError('x is undefined'))).toBe(false);
		expect(isDatabaseDown(null)).toBe(false);
	});
});
