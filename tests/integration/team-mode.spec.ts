// The built server as a team installs it: an empty PostgreSQL database, SMTP_URL to a real
// mail server (here the test catcher, over SMTP), its own ORIGIN. It migrates the database
// on start, creates no demo people, has no mailbox, and a person made admin with the CLI
// signs in through the mail. A demo (no SMTP_URL) on a non-loopback address refuses to start.
import { execFile } from 'node:child_process';
import { promisify } from 'node:util';
import postgres from 'postgres';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { client } from '$lib/server/db';
import { DEMO_BAND } from '$lib/server/deployment';
import { mailbox, unique } from './helpers';
import { portFrom, refusedStart, startServer, type RunningServer } from './servers';

// npm start's database name, on the test cluster: the CLI finds it by npm start's defaults.
const TEAM_DB = 'junctionary';
const pgport = process.env.PGPORT!;
const teamUrl = `postgres://junctionary@127.0.0.1:${pgport}/${TEAM_DB}`;
const smtpUrl = `smtp://127.0.0.1:${process.env.MAIL_SMTP_PORT}`;
let team: postgres.Sql;
let server: RunningServer | null = null;

beforeAll(async () => {
	await client.unsafe(`drop database if exists ${TEAM_DB} with (force)`);
	await client.unsafe(`create database ${TEAM_DB}`);
	team = postgres(teamUrl, { max: 2, onnotice: () => {} });
});

afterAll(async () => {
	await server?.stop();
	await team?.end();
	await client.unsafe(`drop database if exists ${TEAM_DB} with (force)`);
});

const noMail = { MAIL_SMTP_PORT: undefined, MAIL_HTTP_PORT: undefined, MAIL_CATCHER_URL: undefined };

describe('a demo that would be reachable from other machines', () => {
	for (const env of [{ HOST: '0.0.0.0' }, { HOST: undefined }, { HOST: '127.0.0.1', ORIGIN: 'https://junctionary.example' }]) {
		test(`refuses to start (${JSON.stringify(env)}), saying what to set, before touching the database`, async () => {
			const r = await refusedStart(await portFrom('TEST_TEAM_PORT'), { DATABASE_URL: teamUrl, SMTP_URL: undefined, ORIGIN: undefined, ...env });
			expect(r.code).toBe(1);
			expect(r.answered).toBe(false);
			expect(r.output).toMatch(/no SMTP_URL is set/);
			expect(r.output).toMatch(/HOST=127\.0\.0\.1/);
			expect(r.output).toMatch(/Deploying for a team/);
			const [{ n }] = await team`select count(*)::int as n from information_schema.tables where table_schema = 'public'`;
			expect(n).toBe(0);
		});
	}
});

describe('team mode', () => {
	beforeAll(async () => {
		server = await startServer(await portFrom('TEST_TEAM_PORT'), {
			...noMail,
			DATABASE_URL: teamUrl,
			SMTP_URL: smtpUrl,
			PRUNE_EVERY_MS: '500'
		});
	});

	test('the migrations ran on start and nobody — no demo person — exists', async () => {
		const [{ n }] = await team`select count(*)::int as n from users`;
		expect(n).toBe(0);
		const applied = await team`select count(*)::int as n from drizzle.__drizzle_migrations`;
		expect(applied[0].n).toBeGreaterThan(0);
	});

	test('the demo seed, run by hand against it, refuses and loads nobody', async () => {
		const env = { ...process.env, DATABASE_URL: teamUrl, SMTP_URL: smtpUrl };
		const run = promisify(execFile)('npx', ['tsx', 'seed/index.ts'], { env });
		await expect(run).rejects.toMatchObject({ code: 1, stderr: expect.stringMatching(/team installation/) });
		const [{ n }] = await team`select count(*)::int as n from users`;
		expect(n).toBe(0);
	});

	test('there is no mailbox and no demo band', async () => {
		const box = await fetch(`${server!.url}/dev/mailbox`, { redirect: 'manual' });
		expect(box.status).toBe(404);
		const page = await (await fetch(`${server!.url}/signin`)).text();
		expect(page).not.toContain(DEMO_BAND);
		expect(page).not.toContain('demo.test');
	});

	test('the first admin, made with the CLI from npm start’s defaults, signs in through a real mail', async () => {
		const email = `${unique('boss')}@team.example`;
		// A second terminal: no DATABASE_URL, only the port npm start was given.
		const env: NodeJS.ProcessEnv = { ...process.env, PGPORT: pgport };
		delete env.DATABASE_URL;
		const { stdout } = await promisify(execFile)('npx', ['tsx', 'scripts/cli.ts', 'admin', 'grant', '--email', email, '--name', 'Ada Boss'], { env });
		expect(stdout).toContain(`${email} now holds: admin`);

		const asked = await fetch(`${server!.url}/signin`, {
			method: 'POST',
			headers: { origin: server!.url, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ email, next: '/admin' }),
			redirect: 'manual'
		});
		expect(asked.status).toBe(303);
		const mail = await mailbox.waitFor(email, /sign-in link/i);
		const link = mail.links.find((l) => l.startsWith(`${server!.url}/auth/callback/`));
		expect(link, mail.text).toBeTruthy();
		const opened = await fetch(link!, { redirect: 'manual' });
		expect(opened.status).toBe(302);
		expect(opened.headers.get('location')).toBe(`${server!.url}/admin`);
		const cookie = opened.headers.getSetCookie().find((c) => c.startsWith('authjs.session-token='))!.split(';')[0];

		const admin = await fetch(`${server!.url}/admin`, { headers: { cookie }, redirect: 'manual' });
		expect(admin.status).toBe(200);
		const html = await admin.text();
		expect(html).toContain(email);
		expect(html).not.toContain(DEMO_BAND);
		expect((await fetch(`${server!.url}/dev/mailbox`, { headers: { cookie }, redirect: 'manual' })).status).toBe(404);
	});

	test('expired sessions and sign-in links are pruned on the app’s own schedule; live ones stay', async () => {
		const [user] = await team`insert into users (id, email, name) values (${unique('u')}, ${`${unique('old')}@team.example`}, 'Old Timer') returning id`;
		const past = new Date(Date.now() - 60_000);
		const future = new Date(Date.now() + 3600_000);
		const dead = unique('dead');
		const live = unique('live');
		await team`insert into sessions (session_token, user_id, expires) values (${dead}, ${user.id}, ${past}), (${live}, ${user.id}, ${future})`;
		await team`insert into verification_tokens (identifier, token, expires) values ('old@team.example', ${dead}, ${past}), ('old@team.example', ${live}, ${future})`;
		let left = 2;
		for (let i = 0; i < 50 && left > 0; i++) {
			await new Promise((r) => setTimeout(r, 200));
			const [s] = await team`select count(*)::int as n from sessions where session_token = ${dead}`;
			const [v] = await team`select count(*)::int as n from verification_tokens where token = ${dead}`;
			left = s.n + v.n;
		}
		expect(left).toBe(0);
		const [s] = await team`select count(*)::int as n from sessions where session_token = ${live}`;
		const [v] = await team`select count(*)::int as n from verification_tokens where token = ${live}`;
		expect([s.n, v.n]).toEqual([1, 1]);
	});
});
