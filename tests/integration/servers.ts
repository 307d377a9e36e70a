// More app servers for the scale-out and team-mode tests: the same build npm test serves
// (BUILD_DIR), started as its own process with the environment a deployment would give it.
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { resolve } from 'node:path';

export const BUILD_DIR = resolve(process.env.BUILD_DIR ?? '.data/builds/test');

/** A port from the environment (so a checkout can move it), else one the system has free. */
export async function portFrom(variable: string): Promise<number> {
	const given = Number(process.env[variable]);
	if (Number.isInteger(given) && given > 0) return given;
	return freePort();
}

/** A loopback port nothing listens on right now. */
export function freePort(): Promise<number> {
	return new Promise((done, fail) => {
		const s = createServer();
		s.once('error', fail);
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as { port: number }).port;
			s.close(() => done(port));
		});
	});
}

export type RunningServer = { url: string; process: ChildProcess; output: () => string; stop: () => Promise<void> };

/** What every server gets from the test run, before the test's own settings. */
function baseEnv(): Record<string, string> {
	const keep = ['PATH', 'HOME', 'LANG', 'AUTH_SECRET', 'DATABASE_URL', 'BODY_SIZE_LIMIT', 'MAIL_SMTP_PORT', 'MAIL_HTTP_PORT', 'MAIL_CATCHER_URL'];
	const env: Record<string, string> = { NODE_ENV: 'production' };
	for (const k of keep) if (process.env[k] !== undefined) env[k] = process.env[k]!;
	return env;
}

/** Runs `node BUILD_DIR` with the settings given; resolves once its health check answers. */
export async function startServer(port: number, env: Record<string, string | undefined>): Promise<RunningServer> {
	const url = `http://127.0.0.1:${port}`;
	const merged: Record<string, string | undefined> = { ...baseEnv(), HOST: '127.0.0.1', PORT: String(port), ORIGIN: url, ...env };
	for (const [k, v] of Object.entries(merged)) if (v === undefined) delete merged[k];
	const child = spawn(process.execPath, [BUILD_DIR], { env: merged as Record<string, string>, stdio: ['ignore', 'pipe', 'pipe'] });
	let output = '';
	child.stdout.on('data', (d) => (output += d));
	child.stderr.on('data', (d) => (output += d));
	const exited = new Promise<void>((done) => child.once('exit', () => done()));
	const stop = async () => {
		if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
		await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
		if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
	};
	const until = Date.now() + 30_000;
	while (Date.now() < until) {
		if (child.exitCode !== null) throw new Error(`server on ${url} exited (${child.exitCode}):\n${output}`);
		try {
			if ((await fetch(`${url}/api/v1/health`)).ok) return { url, process: child, output: () => output, stop };
		} catch {
			/* not listening yet */
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	await stop();
	throw new Error(`server on ${url} did not answer within 30 s:\n${output}`);
}

/** Runs the server expecting it to refuse to start; resolves with its exit code and output. */
export async function refusedStart(port: number, env: Record<string, string | undefined>): Promise<{ code: number | null; output: string; answered: boolean }> {
	const merged: Record<string, string | undefined> = { ...baseEnv(), PORT: String(port), ...env };
	for (const [k, v] of Object.entries(merged)) if (v === undefined) delete merged[k];
	const child = spawn(process.execPath, [BUILD_DIR], { env: merged as Record<string, string>, stdio: ['ignore', 'pipe', 'pipe'] });
	let output = '';
	child.stdout.on('data', (d) => (output += d));
	child.stderr.on('data', (d) => (output += d));
	const code = await new Promise<number | null>((done) => {
		const timer = setTimeout(() => {
			child.kill('SIGKILL');
			done(null);
		}, 20_000);
		child.once('exit', (c) => {
			clearTimeout(timer);
			done(c);
		});
	});
	return { code, output, answered: /Listening on/.test(output) };
}
