/**
 * The ranking screen in Debian's chromium over the whole catalogue (≥ 10k parts):
 *  - browser-rerank-per-s: inside the page, a script moves the bias slider every animation
 *    frame for RERANK_SECONDS (then, separately, the hot-end slider) and counts the
 *    rankings fully drawn — the list (data-updates) and both charts (data-revision) showing
 *    the same, newer ranking — per second; the worse of the two runs is recorded (goal ≥ 60,
 *    one per frame), with each run's median and worst frame time. The viewport is tall enough for the
 *    list and the charts to be on screen together (off screen the charts wait).
 *  - browser-vs-server-agreement: a ranking worker started in the page ranks 20 operating
 *    points on every basis; each is compared with POST /api/v1/rank for the same fields
 *    (largest relative difference of any number, and whether every order matched; target
 *    ≤ 1e-12; an order mismatch records 1).
 * Needs APP_URL and DATABASE_URL (the running app and its database).
 */
import { randomBytes } from 'node:crypto';
import { cpus, loadavg } from 'node:os';
import { chromium, type Page } from '@playwright/test';
import type { RankOperatingPoint, RankResponse } from '../../src/lib/schemas/rank';
import { agreement } from '../integration/rank-agreement';
import { record } from './results';

const SECONDS = Number(process.env.RERANK_SECONDS ?? 10);

type Run = { drawn: number; frames: number; seconds: number; worstFrameMs: number; medianFrameMs: number };

/** Moves a slider one position per animation frame and counts rankings fully drawn. */
function slide(page: Page, sliderId: string, from: number, to: number, step: number): Promise<Run> {
	return page.evaluate(
		({ sliderId, from, to, step, seconds }) =>
			new Promise<Run>((resolve) => {
				const slider = document.getElementById(sliderId) as HTMLInputElement;
				const list = document.querySelector('[data-updates]') as HTMLElement;
				let drawn = 0;
				let counted = Number(list.dataset.updates);
				let frames = 0;
				let worst = 0;
				const gaps: number[] = [];
				let at = from;
				let dir = Math.sign(to - from);
				const t0 = performance.now();
				let prev = t0;
				const frame = (now: number) => {
					worst = Math.max(worst, now - prev);
					gaps.push(now - prev);
					prev = now;
					frames++;
					const shown = Number(list.dataset.updates);
					// Looked up each frame: the figures may come into the page with the first ranking drawn.
					const charts = document.querySelector<HTMLElement>('[data-revision]');
					if (shown !== counted && charts && Number(charts.dataset.revision) === shown) {
						drawn++;
						counted = shown;
					}
					if (now - t0 >= seconds * 1000) {
						gaps.sort((a, b) => a - b);
						return resolve({ drawn, frames, seconds: (now - t0) / 1000, worstFrameMs: worst, medianFrameMs: gaps[gaps.length >> 1] ?? 0 });
					}
					// Back and forth between the two positions, one step a frame.
					at += dir * step;
					if ((dir > 0 && at >= Math.max(from, to)) || (dir < 0 && at <= Math.min(from, to))) dir = -dir;
					slider.value = String(at);
					slider.dispatchEvent(new Event('input', { bubbles: true }));
					requestAnimationFrame(frame);
				};
				requestAnimationFrame((now) => {
					prev = now;
					requestAnimationFrame(frame);
				});
			}),
		{ sliderId, from, to, step, seconds: SECONDS }
	);
}

/** 20 operating points across the screen's range: reverse and forward, ranges, limits, filters. */
function operatingPoints(): RankOperatingPoint[] {
	return Array.from({ length: 20 }, (_, k) => ({
		biasV: k === 19 ? 0.25 : -(0.05 * 1.45 ** k),
		...(k % 3 === 0 ? { temperatureC: 25 + 5 * k } : { temperatureRangeC: [-40 + 2 * k, 60 + 4 * k] as [number, number] }),
		...(k % 4 === 1 ? { clampCurrentA: 1e-3 * (1 + k), maxForwardDropV: 0.8 } : {}),
		...(k % 5 === 2 ? { leakageTargetA: 1e-9 } : {}),
		...(k % 6 === 3 ? { maxCapacitanceF: 4e-12, includeOverRating: true } : {}),
		...(k % 7 === 4 ? { kinds: ['diode', 'schottky'] as RankOperatingPoint['kinds'] } : {})
	}));
}

/** Ranks every point on every basis in a ranking worker of the page's own build. */
function rankInPage(page: Page, ops: RankOperatingPoint[]): Promise<RankResponse[]> {
	return page.evaluate(async (ops) => {
		const url = performance
			.getEntriesByType('resource')
			.map((e) => e.name)
			.find((n) => /rank\.worker/.test(n));
		if (!url) throw new Error('the page started no ranking worker');
		const worker = new Worker(url, { type: 'module' });
		const answers = new Map<number, RankResponse>();
		let loaded!: () => void;
		let fail!: (e: Error) => void;
		const failed = new Promise<never>((_, reject) => (fail = reject));
		const ready = new Promise<void>((r) => (loaded = r));
		const waiting = new Map<number, () => void>();
		worker.onmessage = (e) => {
			if (e.data.type === 'loaded') loaded();
			if (e.data.type === 'ranked') {
				answers.set(e.data.seq, e.data.result);
				waiting.get(e.data.seq)?.();
			}
			if (e.data.type === 'rank-failed' || e.data.type === 'load-failed') fail(new Error(e.data.message));
		};
		worker.postMessage({ type: 'load' });
		await Promise.race([ready, failed]);
		const out: RankResponse[] = [];
		for (let seq = 0; seq < ops.length; seq++) {
			const answered = new Promise<void>((r) => waiting.set(seq, r));
			worker.postMessage({ type: 'rank', seq, op: ops[seq], limit: 1000, withModels: 5 });
			await Promise.race([answered, failed]);
			out.push(answers.get(seq)!);
		}
		worker.terminate();
		return out;
	}, ops);
}

export async function runBrowserBenchmarks(): Promise<void> {
	const appUrl = process.env.APP_URL;
	if (!appUrl) return console.log('browser benchmarks skipped: APP_URL is not set');
	const people = await import('../../src/lib/server/people');
	const { db } = await import('../../src/lib/server/db');
	const { sessions } = await import('../../src/lib/server/db/schema');
	const designer = await people.findByEmail('designer@demo.test');
	if (!designer) throw new Error('demo designer missing');
	const sessionToken = randomBytes(24).toString('hex');
	await db.insert(sessions).values({ sessionToken, userId: designer.id, expires: new Date(Date.now() + 3600_000) });

	const browser = await chromium.launch({
		executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
		args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--no-first-run']
	});
	try {
		const context = await browser.newContext({ viewport: { width: 1280, height: 2600 } });
		await context.addCookies([{ name: 'authjs.session-token', value: sessionToken, url: appUrl }]);
		// tsx names the functions it compiles with a helper (__name) that the page does not have.
		await context.addInitScript('globalThis.__name = (f) => f;');
		const page = await context.newPage();
		// A renderer that crashes would leave the in-page loop waiting for ever: say so at once.
		const crashed = new Promise<never>((_, reject) => page.on('crash', () => reject(new Error('the page crashed in chromium'))));
		crashed.catch(() => {});
		await page.goto(`${appUrl}/rank?v=-5&tlo=0&thi=85`);
		await page.locator('[data-ranks-in="browser"]').waitFor({ state: 'attached', timeout: 60_000 });
		const evaluated = (await page.getByText(/parts evaluated/).first().innerText()).match(/^[\d,]+/)?.[0] ?? '?';
		const root = page.locator('[data-snapshot-bytes]');
		const snapshot = { bytes: Number(await root.getAttribute('data-snapshot-bytes')), ms: Number(await root.getAttribute('data-snapshot-ms')) };

		// Bias from −1 V to −20 V and back (slider positions of the logarithmic scale); hot end 25…125 °C.
		const loadBefore = loadavg()[0];
		const bias = await Promise.race([slide(page, 'op-bias-slider', -0.566, -0.811, 0.004), crashed]);
		const hot = await Promise.race([slide(page, 'op-thi-slider', 25, 125, 1), crashed]);
		const rate = (r: Run) => r.drawn / r.seconds;
		const worse = Math.min(rate(bias), rate(hot));
		const words = (r: Run) => `${r.drawn} in ${r.seconds.toFixed(1)} s (${r.frames} frames, median ${r.medianFrameMs.toFixed(1)} ms, worst ${r.worstFrameMs.toFixed(0)} ms)`;
		record(
			'browser-rerank-per-s',
			worse,
			60,
			`slider moved every animation frame in Debian chromium, ${evaluated} parts, rankings drawn with both charts: bias ${words(bias)}, hot end ${words(hot)}; snapshot ${(snapshot.bytes / 1e6).toFixed(2)} MB fetched and built in the worker in ${snapshot.ms} ms; machine shared with other work (load average ${loadBefore.toFixed(1)} before, ${loadavg()[0].toFixed(1)} after, on ${cpus().length} cores)`
		);
		console.log(`browser-rerank-per-s: bias ${rate(bias).toFixed(1)}, hot end ${rate(hot).toFixed(1)} (median frames ${bias.medianFrameMs.toFixed(1)} / ${hot.medianFrameMs.toFixed(1)} ms, worst ${bias.worstFrameMs.toFixed(0)} / ${hot.worstFrameMs.toFixed(0)} ms)`);

		const ops = operatingPoints().flatMap((op) => (['bound', 'worst', 'typical'] as const).map((basis) => ({ ...op, basis })));
		const inPage = await rankInPage(page, ops);
		let maxRelative = 0;
		let mismatched = 0;
		let items = 0;
		for (let k = 0; k < ops.length; k++) {
			const res = await page.request.post(`${appUrl}/api/v1/rank`, { data: { ...ops[k], limit: 1000, withModels: 5 } });
			const server = (await res.json()) as RankResponse;
			const a = agreement(inPage[k], server);
			maxRelative = Math.max(maxRelative, a.maxRelative);
			if (!a.sameOrder || a.mismatch) mismatched++;
			items += server.items.length;
		}
		record(
			'browser-vs-server-agreement',
			mismatched ? Math.max(1, maxRelative) : maxRelative,
			1e-12,
			`20 operating points × 3 bases over ${evaluated} parts, the best 1000 of each (${items} items): largest relative difference ${maxRelative.toExponential(2)}, ${mismatched} of ${ops.length} rankings differing in order or content (Chromium's worker against the server)`
		);
		console.log(`browser-vs-server-agreement: max relative ${maxRelative}, ${mismatched} mismatched of ${ops.length}`);
	} finally {
		await browser.close();
	}
}
