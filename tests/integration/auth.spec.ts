// Sign-in by e-mail link through the real SMTP catcher, sessions, API tokens and the
// people screen, against the running app and PostgreSQL.
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import { and, eq } from 'drizzle-orm';
import { describe, expect, test } from 'vitest';
import { db } from '$lib/server/db';
import { auditLog, sessions, userRoles, users } from '$lib/server/db/schema';
import * as people from '$lib/server/people';
import * as tokens from '$lib/server/tokens';
import { APP_URL, api, browse, mailbox, unique } from './helpers';

async function newPerson(roles: ('designer' | 'lead')[] = ['designer']) {
	const email = `${unique('p')}@demo.test`;
	return people.upsert({ email, name: 'Test Person', roles }, null);
}

async function requestLink(email: string) {
	return fetch(`${APP_URL}/signin`, {
		method: 'POST',
		headers: { accept: 'text/html', origin: APP_URL, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, next: '/' }),
		redirect: 'manual'
	});
}

function sessionCookie(res: Response): { value: string; attributes: string } | null {
	for (const c of res.headers.getSetCookie()) {
		const m = c.match(/^authjs\.session-token=([^;]+);(.*)$/);
		if (m && m[1]) return { value: m[1], attributes: m[2] };
	}
	return null;
}

describe('sign-in by e-mail link', () => {
	test('request, read the mail, open the link, get a session; the link works only once', async () => {
		const person = await newPerson();
		const res = await requestLink(person.email);
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toMatch(/^\/signin\/check-mail/);

		const mail = await mailbox.waitFor(person.email, /sign-in link/i);
		const link = mail.links.find((l) => l.includes('/auth/callback/'));
		expect(link).toBeTruthy();

		const opened = await fetch(link!, { redirect: 'manual' });
		expect(opened.status).toBe(302);
		const cookie = sessionCookie(opened);
		expect(cookie).not.toBeNull();
		expect(cookie!.attributes).toMatch(/HttpOnly/i);
		expect(cookie!.attributes).toMatch(/SameSite=Lax/i);

		const home = await fetch(`${APP_URL}/`, { headers: { cookie: `authjs.session-token=${cookie!.value}` }, redirect: 'manual' });
		expect(home.status).toBe(200);
		const html = await home.text();
		expect(html).toContain('Good to see you');
		// Page data names the person but never carries the session token.
		expect(html).not.toContain(cookie!.value);

		const again = await fetch(link!, { redirect: 'manual' });
		expect(again.status).toBe(302);
		expect(again.headers.get('location')).toMatch(/\/signin\?error=Verification/);
		expect(sessionCookie(again)).toBeNull();
	});

	test('an address that is not on the team gets the same answer and no mail', async () => {
		const stranger = `${unique('x')}@elsewhere.test`;
		const res = await requestLink(stranger);
		expect(res.status).toBe(303);
		await new Promise((r) => setTimeout(r, 500));
		expect(await mailbox.list(stranger)).toEqual([]);
	});

	test('a malformed address is refused beside the field', async () => {
		const res = await browse('/signin', { form: { email: 'not an address' } });
		expect(res.status).toBe(400);
		expect(res.text).toContain('Enter an e-mail address');
	});

	test('links to one address are limited: the sixth request within 15 minutes is refused', async () => {
		const person = await newPerson();
		const statuses = [];
		for (let i = 0; i < 6; i++) statuses.push((await requestLink(person.email)).status);
		expect(statuses).toEqual([303, 303, 303, 303, 303, 429]);
	});

	test('a cross-site form post is refused by the origin check', async () => {
		const res = await browse('/signin', { form: { email: 'designer@demo.test' }, origin: 'http://evil.test' });
		expect(res.status).toBe(403);
	});

	test('a session cookie is refused once its session has expired, and while its person is deactivated', async () => {
		const person = await newPerson();
		const live = unique('s');
		const expired = unique('s');
		await db.insert(sessions).values([
			{ sessionToken: live, userId: person.id, expires: new Date(Date.now() + 60_000) },
			{ sessionToken: expired, userId: person.id, expires: new Date(Date.now() - 1_000) }
		]);
		const home = (token: string) => fetch(`${APP_URL}/`, { headers: { cookie: `authjs.session-token=${token}` }, redirect: 'manual' });
		expect((await home(live)).status).toBe(200);
		const refused = await home(expired);
		expect(refused.status).toBe(303);
		expect(refused.headers.get('location')).toMatch(/^\/signin\?next=/);

		await db.update(users).set({ deactivatedAt: new Date() }).where(eq(users.id, person.id));
		expect((await home(live)).status).toBe(303);
		await db.update(users).set({ deactivatedAt: null }).where(eq(users.id, person.id));
		expect((await home(live)).status).toBe(200);
	});

	test('signing out ends the session in the database', async () => {
		const person = await newPerson();
		const token = unique('s');
		await db.insert(sessions).values({ sessionToken: token, userId: person.id, expires: new Date(Date.now() + 60_000) });
		const res = await fetch(`${APP_URL}/signout`, {
			method: 'POST',
			headers: { cookie: `authjs.session-token=${token}`, origin: APP_URL, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
			body: '',
			redirect: 'manual'
		});
		expect(res.status).toBe(303);
		expect(await db.select().from(sessions).where(eq(sessions.sessionToken, token))).toEqual([]);
	});
});

describe('API tokens', () => {
	test('a valid token acts with its owner’s roles; revoked and forged tokens get 401', async () => {
		const person = await newPerson(['designer']);
		const { id, token } = await tokens.create(person.id, 'bench PC');
		const ok = await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } });
		expect(ok.status).toBe(200);
		const write = await fetch(`${APP_URL}/api/v1/junctions`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body: '{}' });
		expect(write.status).toBe(403);
		expect((await write.json()).error.code).toBe('forbidden');

		const forged = token.slice(0, -4) + (token.endsWith('AAAA') ? 'BBBB' : 'AAAA');
		for (const bad of [forged, 'jct_nonsense', 'not-even-a-token']) {
			const r = await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${bad}` } });
			expect(r.status, bad).toBe(401);
			expect((await r.json()).error.code).toBe('unauthenticated');
		}

		// Revoked by this process, not the server: refused once the server hears of it (milliseconds;
		// a revocation on the server itself counts from its next request, token-identity.spec.ts).
		expect(await tokens.revoke(person.id, id)).toBe(true);
		const revoked = () => fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } }).then((r) => r.status);
		await expect.poll(revoked, { timeout: 2000, interval: 20 }).toBe(401);
	});

	test('only the hash is stored and last use is recorded', async () => {
		const person = await newPerson();
		const { id, token } = await tokens.create(person.id, 'script');
		await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } });
		const [row] = (await tokens.listFor(person.id)).filter((t) => t.id === id);
		expect(row.lastUsedAt).not.toBeNull();
		expect(JSON.stringify(row)).not.toContain(token);
	});

	test('the tokens page creates a token shown once', async () => {
		const res = await browse('/account/tokens?/create', { as: 'designer', form: { name: 'lab script' } });
		expect(res.status).toBe(200);
		expect(res.text).toMatch(/jct_[A-Za-z0-9_-]{20,}/);
	});

	test('npm run cli -- token create prints a working token', async () => {
		const { stdout } = await promisify(execFile)('npx', ['tsx', 'scripts/cli.ts', 'token', 'create', '--email', 'librarian@demo.test'], {
			env: process.env
		});
		const token = stdout.trim().split('\n').pop()!;
		const r = await fetch(`${APP_URL}/api/v1/junctions`, { headers: { authorization: `Bearer ${token}` } });
		expect(r.status).toBe(200);
	});

	test('the health check is public and every other API route wants a caller', async () => {
		expect((await api('GET', '/api/v1/health')).body).toEqual({ ok: true });
		const r = await api('GET', '/api/v1/junctions');
		expect(r.status).toBe(401);
		expect(r.body.error).toMatchObject({ code: 'unauthenticated' });
	});
});

describe('people and roles', () => {
	test('an admin invites a person: the person exists with the roles, an audit row is written, the invitation is mailed', async () => {
		const email = `${unique('inv')}@demo.test`;
		const res = await browse('/admin?/invite', { as: 'admin', form: { email, name: 'Ines Vale', roles: 'lead' } });
		expect(res.status).toBe(200);
		const person = await people.findByEmail(email);
		expect(person?.roles).toEqual(['lead']);
		const audit = await db.select().from(auditLog).where(and(eq(auditLog.entityId, person!.id), eq(auditLog.action, 'person.invited')));
		expect(audit).toHaveLength(1);
		const mail = await mailbox.waitFor(email, /invited/i);
		expect(mail.text).toContain('/signin');
	});

	test('granting and revoking a role is recorded', async () => {
		const person = await newPerson(['designer']);
		await browse('/admin?/role', { as: 'admin', form: { userId: person.id, role: 'librarian', grant: '1', confirm: '1' } });
		expect((await people.findById(person.id))?.roles).toEqual(['designer', 'librarian']);
		await browse('/admin?/role', { as: 'admin', form: { userId: person.id, role: 'designer', grant: '0', confirm: '1' } });
		expect((await db.select().from(userRoles).where(eq(userRoles.userId, person.id))).map((r) => r.role)).toEqual(['librarian']);
		const actions = (await db.select().from(auditLog).where(eq(auditLog.entityId, person.id))).map((a) => a.action);
		expect(actions).toEqual(expect.arrayContaining(['role.granted', 'role.revoked']));
	});

	test('bad invitation input is refused with the field named, and nothing is written', async () => {
		const before = (await people.list()).length;
		const res = await browse('/admin?/invite', { as: 'admin', form: { email: 'nope', name: '' } });
		expect(res.status).toBe(400);
		expect(res.text).toContain('Enter an e-mail address');
		expect((await people.list()).length).toBe(before);
	});
});
