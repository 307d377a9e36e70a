// Sweeps for the catalogue tests, written out here so each test shows what it sends.
import { sql } from 'drizzle-orm';
import { db } from '$lib/server/db';

const VT25 = 0.025693; // kT/q at 25 °C [V] (k and q: SI 2019 exact values)

/** An ideal forward sweep I = IS·exp(V/(N·Vt)), with RS: V = N·Vt·ln(I/IS) + I·RS. */
export function forwardCsv(opts: { IS?: number; N?: number; RS?: number; from?: number; to?: number; steps?: number; header?: string } = {}): string {
	const { IS = 1e-14, N = 1.05, RS = 2, from = 1e-9, to = 1e-3, steps = 25, header = 'V (V),I (A)' } = opts;
	const lines = [header];
	// A few random digits past the 7th in the first voltage make every file's bytes (and
	// SHA-256) new, so reruns are not refused as duplicates; the change is below 1 nV. Nine
	// digits: with three, two of the suite's many stored sweeps met now and then (a 409).
	const salt = String(Math.floor(Math.random() * 9e8) + 1e8);
	for (let k = 0; k <= steps; k++) {
		const i = from * (to / from) ** (k / steps);
		const v = N * VT25 * Math.log(i / IS + 1) + i * RS;
		lines.push(`${v.toPrecision(7)}${k === 0 ? salt : ''},${i.toPrecision(7)}`);
	}
	return lines.join('\n') + '\n';
}

export const TABLES = ['parts', 'samples', 'runs', 'fits', 'part_models', 'part_capacitance', 'audit_log'] as const;

/** Row counts of every table an upload could touch. */
export async function counts(): Promise<Record<string, number>> {
	const out: Record<string, number> = {};
	for (const t of TABLES) {
		const [r] = await db.execute<{ n: number }>(sql.raw(`select count(*)::int as n from ${t}`));
		out[t] = Number(r.n);
	}
	return out;
}

/**
 * A C–V sweep from the SPICE depletion formula C = CJO·(1 − V/VJ)^(−M) (Nagel, SPICE2, 1975),
 * plus a stray capacitance, as an LCR meter would give it; `header: null` writes no header.
 */
export function cvCsv(opts: { CJO?: number; VJ?: number; M?: number; from?: number; to?: number; steps?: number; strayF?: number; header?: string | null } = {}): string {
	const { CJO = 3e-12, VJ = 0.7, M = 0.35, from = -10, to = 0, steps = 20, strayF = 0, header = 'V (V),C (pF)' } = opts;
	const lines = header === null ? [] : [header];
	const perPf = header === null || /\(F\)/.test(header) ? 1 : 1e12;
	// A salt in the first voltage's far digits keeps every file's SHA-256 new (below 1 nV).
	const salt = String(Math.floor(Math.random() * 900) + 100);
	for (let k = 0; k <= steps; k++) {
		const v = from + ((to - from) * k) / steps;
		const c = CJO * (1 - v / VJ) ** -M + strayF;
		lines.push(`${v.toFixed(4)}${k === 0 ? `00${salt}` : ''},${(c * perPf).toPrecision(9)}`);
	}
	return lines.join('\n') + '\n';
}

/** The depletion formula itself, for expected values. */
export const depletion = (p: { CJO: number; VJ: number; M: number }, v: number) => p.CJO * (1 - v / p.VJ) ** -p.M;
