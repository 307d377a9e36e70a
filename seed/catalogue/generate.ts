// Writes the demo sweeps in seed/catalogue/files/ from invented "true" parameters with a
// seeded random generator, so the files are the same on every run. Regenerate with
//   npx tsx seed/catalogue/generate.ts
// Each unit's parameters scatter around its part's (IS ×/÷ 1.35, N ± 0.5 %, RS ± 8 %,
// RSH ×/÷ 2); the forward leg is current-forced, decade ranges overlapping by one point,
// with 0.15 mV voltmeter noise; the reverse leg is voltage-forced with 1 % + 3 fA
// electrometer noise.
import { mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createModel, currentAtBias, saturationCurrentAt, scaleModel, voltageAtCurrent } from '../../src/lib/junction';
import { engineMaterial } from '../../src/lib/catalogue/models';
import { DEFAULT_MATERIAL } from '../../src/lib/catalogue/vocabulary';
import { DEMO_PARTS, type DemoPart } from './parts';
import { gaussian, mulberry32 } from '../../src/lib/random';
import { writeCapacitanceSweeps, type CvManifestEntry } from './cv-sweeps';

export type ManifestEntry = { file: string; part: string; sample: string; lot: string; dateCode: string; temperatureC: number } | CvManifestEntry;

const DIR = new URL('./files/', import.meta.url).pathname;

const rand = mulberry32(20240611);
const gauss = gaussian(rand);

const RANGES = [
	{ label: '10nA', top: 1e-8 },
	{ label: '1uA', top: 1e-6 },
	{ label: '100uA', top: 1e-4 },
	{ label: '10mA', top: 1e-2 },
	{ label: '100mA', top: 1e-1 }
];

type Row = { v: number; i: number; range: string };

function forwardLeg(model: ReturnType<typeof scaleModel>, iLo: number, iHi: number): Row[] {
	const rows: Row[] = [];
	const lo = Math.log10(iLo);
	const hi = Math.log10(iHi);
	const steps = Math.max(24, Math.round((hi - lo) * 6));
	let lastRange = '';
	for (let k = 0; k <= steps; k++) {
		const i = 10 ** (lo + ((hi - lo) * k) / steps);
		const range = RANGES.find((r) => i <= r.top * 1.0001) ?? RANGES[RANGES.length - 1];
		const v = voltageAtCurrent(model, i);
		const read = (r: string) => rows.push({ v: v + 1.5e-4 * gauss(), i: i * (1 + 0.001 * gauss()), range: r });
		// At a range change the tracer repeats the point on the new range: overlapping readings.
		if (lastRange && range.label !== lastRange) read(lastRange);
		read(range.label);
		lastRange = range.label;
	}
	return rows;
}

function reverseLeg(model: ReturnType<typeof scaleModel>, vMax: number): Row[] {
	const rows: Row[] = [];
	const steps = 14;
	for (let k = 0; k < steps; k++) {
		const v = -vMax + (vMax * k) / steps;
		const i = currentAtBias(model, v);
		rows.push({ v, i: i * (1 + 0.01 * gauss()) + 3e-15 * gauss(), range: '10nA' });
	}
	return rows;
}

const fmt = (x: number) => Number(x.toPrecision(6)).toString();

function write(style: number, rows: Row[], temperatureC: number): string {
	if (style === 1) {
		// Semicolons and decimal commas, millivolts and nanoamps, a temperature column.
		const c = (x: number) => fmt(x).replace('.', ',');
		return 'Bias (mV);I [nA];Temp (°C)\n' + rows.map((r) => `${c(r.v * 1e3)};${c(r.i * 1e9)};${c(temperatureC)}`).join('\n') + '\n';
	}
	if (style === 2) return 'voltage_V,current_uA\n' + rows.map((r) => `${fmt(r.v)},${fmt(r.i * 1e6)}`).join('\n') + '\n';
	return 'V (V),I (A),Range\n' + rows.map((r) => `${fmt(r.v)},${fmt(r.i)},${r.range}`).join('\n') + '\n';
}

function unitTruth(p: DemoPart) {
	return {
		IS: p.truth.IS * Math.exp(0.3 * gauss()),
		N: p.truth.N * (1 + 0.005 * gauss()),
		RS: p.truth.RS * (1 + 0.08 * gauss()),
		RSH: p.truth.RSH * Math.exp(0.7 * gauss())
	};
}

/** Invented lot and date code of a part's sample s, the same for its I–V and C–V files. */
function lotOf(p: DemoPart, s: number) {
	return { lot: `L${(p.key.length * 7 + s) % 9}${String.fromCharCode(65 + (s % 3))}`, dateCode: `2${3 + (s % 2)}${String(10 + ((s * 7) % 40)).padStart(2, '0')}` };
}

export function generate(): ManifestEntry[] {
	mkdirSync(DIR, { recursive: true });
	for (const f of readdirSync(DIR)) if (f.endsWith('.csv') || f === 'manifest.json') rmSync(DIR + f);
	const manifest: ManifestEntry[] = [];
	let fileNo = 0;
	for (const p of DEMO_PARTS) {
		const material = p.material ?? DEFAULT_MATERIAL[p.kind];
		for (let s = 1; s <= p.samples; s++) {
			const t = unitTruth(p);
			const model = createModel({ ...t, EG: p.truth.EG, TNOM: 25 }, engineMaterial(material));
			const unit = `U${s}`;
			const { lot, dateCode } = lotOf(p, s);
			const iHi = Math.min(0.3 * (p.ratings.forwardA ?? 0.01), 0.05);
			const temps = [25, ...(p.hot && s <= 2 ? [p.hot] : [])];
			for (const T of temps) {
				const scaled = scaleModel(model, T);
				// Start well above IS so the forward leg has a usable slope.
				const iLo = Math.max(1e-9, 30 * saturationCurrentAt(model, T));
				let rows = forwardLeg(scaled, Math.min(iLo, iHi / 1000), iHi);
				if (p.reverse && T === 25) {
					// Bench rule: stay at or below half the rated reverse voltage, and never past 10 V.
					rows = [...reverseLeg(scaled, Math.min(10, 0.5 * (p.ratings.reverseV ?? 5))), ...rows];
				}
				const style = fileNo++ % 5 === 3 ? 1 : fileNo % 7 === 2 ? 2 : 0;
				const file = `${p.key}_${unit}_${T}C${p.reverse && T === 25 ? '_fr' : ''}.csv`;
				writeFileSync(DIR + file, write(style, rows, T));
				manifest.push({ file, part: p.key, sample: unit, lot, dateCode, temperatureC: T });
			}
		}
	}
	manifest.push(...writeCapacitanceSweeps(DIR, DEMO_PARTS, lotOf));
	writeFileSync(DIR + 'manifest.json', JSON.stringify(manifest, null, 1) + '\n');
	return manifest;
}

if (import.meta.url === `file://${process.argv[1]}`) {
	const m = generate();
	console.log(`${m.length} sweep files written to ${DIR}`);
}
