// A second `npm start` from the same checkout must leave the running one alone: it says
// where that one is and stops, building nothing. Tests and benchmarks serve from their
// own build folders, so the server under test is not the one npm start builds.
import { execFile, spawn } from 'node:child_process';
import { existsSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { promisify } from 'node:util';
import { expect, test } from 'vitest';
import { APP_URL } from './helpers';
import { BUILD_DIR } from './servers';

const DATA = resolve('.data');
const STATE = `${DATA}/start.json`;

test('npm test serves from its own build folder, not build/ and not npm start’s', () => {
	expect(BUILD_DIR).toBe(resolve('.data/builds/test'));
	expect(existsSync(`${BUILD_DIR}/index.js`)).toBe(true);
});

test('a second npm start finds the running one, says where it is, and builds nothing', async () => {
	// Play the first npm start: hold its lock (unless a real one already does) and its record.
	// Its own process group, so that stopping it also stops the sleep that inherits the lock.
	const holder = spawn('flock', ['-n', `${DATA}/start.lock`, 'sleep', '120'], { stdio: 'ignore', detached: true });
	const ours = !existsSync(STATE);
	if (ours) writeFileSync(STATE, JSON.stringify({ url: 'http://127.0.0.1:39999', pid: holder.pid, mode: 'demo', startedAt: new Date().toISOString() }));
	const where = JSON.parse(readFileSync(STATE, 'utf8')).url as string;
	const startBuild = `${DATA}/builds/start/index.js`;
	const builtBefore = existsSync(startBuild) ? statSync(startBuild).mtimeMs : null;
	try {
		await new Promise((r) => setTimeout(r, 200));
		const env = { ...process.env };
		for (const k of ['DATABASE_URL', 'PGPORT', 'PORT', 'HOST', 'ORIGIN', 'SMTP_URL']) delete env[k];
		const { stdout } = await promisify(execFile)('bash', ['scripts/start.sh'], { env, timeout: 60_000 });
		expect(stdout).toContain('already running from this checkout');
		expect(stdout).toContain(where);
		expect(existsSync(startBuild) ? statSync(startBuild).mtimeMs : null).toBe(builtBefore);
	} finally {
		try {
			process.kill(-holder.pid!, 'SIGTERM');
		} catch {
			/* already gone: a real npm start held the lock */
		}
		if (ours) rmSync(STATE, { force: true });
	}
	// The server under test kept answering.
	expect((await fetch(`${APP_URL}/api/v1/health`)).status).toBe(200);
});
