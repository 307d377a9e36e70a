// A known API token is answered from the server's memory, so every change to what it may
// do must reach that memory. A change made through this server counts from its very next
// request: revocation on the tokens page, deactivation and role changes on the admin page.
// A change made by another process (the CLI, a second server: here this test process,
// writing through the same domain code) counts as soon as its announcement arrives, which
// is a matter of milliseconds. The end date, which nothing announces, is checked every time.
import { describe, expect, test } from 'vitest';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { APP_URL, browse, cookieFor, personFor, unique } from './helpers';

async function newPerson(roles: ('designer' | 'librarian')[] = ['designer']) {
	return people.upsert({ email: `${unique('tok')}@demo.test`, name: `Ysolde ${unique('Marrack')}`, roles }, null);
}

const read = (token: string) => fetch(`${APP_URL}/api/v1/junctions?limit=1`, { headers: { authorization: `Bearer ${token}` } }).then((r) => r.status);
/** A part-creation attempt with an empty body: 403 without the librarian role, 400 (the body named) with it. */
const write = (token: string) =>
	fetch(`${APP_URL}/api/v1/junctions`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: '{}' }).then((r) => r.status);
/** The announcement of a change made elsewhere arrives within this (it takes milliseconds). */
const ANNOUNCED = { timeout: 2000, interval: 20 };

describe('a token the server already knows, changed through this server', () => {
	test('revoked on its owner’s tokens page: the very next request is refused', async () => {
		const designer = await personFor('designer');
		const { id, token } = await tokens.create(designer.id, unique('page revoke'), designer.id);
		// Twice, so the second answer comes from what the server keeps.
		expect([await read(token), await read(token)]).toEqual([200, 200]);
		const res = await fetch(`${APP_URL}/account/tokens?/revoke`, {
			method: 'POST',
			headers: { cookie: await cookieFor('designer'), origin: APP_URL, 'content-type': 'application/x-www-form-urlencoded', accept: 'application/json' },
			body: new URLSearchParams({ id: String(id) })
		});
		expect(res.status).toBe(200);
		expect(await read(token)).toBe(401);
	});

	test('its owner deactivated on the admin page: the very next request is refused', async () => {
		const p = await newPerson();
		const { token } = await tokens.create(p.id, 'bench PC', p.id);
		expect([await read(token), await read(token)]).toEqual([200, 200]);
		const done = await browse('/admin?/deactivate', { as: 'admin', form: { userId: p.id, confirm: '1' } });
		expect(done.status).toBe(200);
		expect(await read(token)).toBe(401);
	});

	test('a role granted or taken away on the admin page counts from the next request', async () => {
		const p = await newPerson(['designer']);
		const { token } = await tokens.create(p.id, 'uploads', p.id);
		expect([await write(token), await write(token)]).toEqual([403, 403]);
		expect((await browse('/admin?/role', { as: 'admin', form: { userId: p.id, role: 'librarian', grant: '1', confirm: '1' } })).status).toBe(200);
		expect(await write(token)).toBe(400);
		expect((await browse('/admin?/role', { as: 'admin', form: { userId: p.id, role: 'librarian', grant: '0', confirm: '1' } })).status).toBe(200);
		expect(await write(token)).toBe(403);
	});

	test('past its end date it is refused, though nothing announced it', async () => {
		const p = await newPerson();
		const endsAt = Date.now() + 1500;
		const { token } = await tokens.create(p.id, 'short-lived', p.id, new Date(endsAt));
		expect([await read(token), await read(token)]).toEqual([200, 200]);
		await new Promise((r) => setTimeout(r, endsAt - Date.now() + 50));
		expect(await read(token)).toBe(401);
	});
});

describe('a token the server already knows, changed by another process', () => {
	test('revoked: refused once the revocation is announced, and from then on', async () => {
		const p = await newPerson();
		const { id, token } = await tokens.create(p.id, 'script', p.id);
		expect([await read(token), await read(token)]).toEqual([200, 200]);
		expect(await tokens.revoke(p.id, id)).toBe(true);
		await expect.poll(() => read(token), ANNOUNCED).toBe(401);
		expect(await read(token)).toBe(401);
	});

	test('its owner deactivated: every token refused, and still after reactivation', async () => {
		const p = await newPerson();
		const admin = await personFor('admin');
		const a = await tokens.create(p.id, 'bench PC', p.id);
		const b = await tokens.create(p.id, 'second', p.id);
		expect([await read(a.token), await read(b.token)]).toEqual([200, 200]);
		await people.deactivate(p.id, admin.id);
		await expect.poll(async () => [await read(a.token), await read(b.token)], ANNOUNCED).toEqual([401, 401]);
		await people.reactivate(p.id, admin.id);
		expect(await read(a.token)).toBe(401);
	});

	test('a role granted and taken away', async () => {
		const p = await newPerson(['designer']);
		const admin = await personFor('admin');
		const { token } = await tokens.create(p.id, 'uploads', p.id);
		expect([await write(token), await write(token)]).toEqual([403, 403]);
		await people.setRole(p.id, 'librarian', true, admin.id);
		await expect.poll(() => write(token), ANNOUNCED).toBe(400);
		await people.setRole(p.id, 'librarian', false, admin.id);
		await expect.poll(() => write(token), ANNOUNCED).toBe(403);
	});
});
