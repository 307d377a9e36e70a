// Writes the demo campaign in seed/campaign/: a parts list (parts.csv) of four invented parts
// not in the demo catalogue, and their bench folder (sweeps/, 36 files named as a bench
// program names them). Import the list on "Import a parts list", then the folder (or
// campaign.zip) on "Import a folder of sweeps". Regenerate with
//   npx tsx seed/campaign/generate.ts
// Measurements come from invented "true" parameters with a seeded random generator, so the
// files are the same on every run: forward legs current-forced with 0.15 mV voltmeter noise,
// the 25 °C files also a reverse leg with 1 % + 3 fA electrometer noise.
import { mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { zipSync, strToU8 } from 'fflate';
import { createModel, currentAtBias, saturationCurrentAt, scaleModel, voltageAtCurrent } from '../../src/lib/junction';
import { engineMaterial } from '../../src/lib/catalogue/models';
import { DEFAULT_MATERIAL, type JunctionKind } from '../../src/lib/catalogue/vocabulary';
import { gaussian, mulberry32 } from '../../src/lib/random';

const ROOT = new URL('./', import.meta.url).pathname;
const DIR = ROOT + 'sweeps/';
const rand = mulberry32(20261202);
const gauss = gaussian(rand);

const MAKER = 'Ferncastle Semiconductor';
const PARTS: { pn: string; kind: JunctionKind; pkg: string; vr: string; ifa: string; tj: string; tags: string; truth: { IS: number; N: number; RS: number; RSH: number } }[] = [
	{ pn: 'FCS-D5', kind: 'diode', pkg: 'SOD-323', vr: '75', ifa: '200', tj: '150', tags: 'clamp; low-leakage', truth: { IS: 3e-15, N: 1.03, RS: 1.5, RSH: 5e11 } },
	{ pn: 'FCS-D7L', kind: 'diode', pkg: 'SOT-23', vr: '40', ifa: '100', tj: '150', tags: 'picoamp; guard', truth: { IS: 8e-16, N: 1.01, RS: 5, RSH: 3e12 } },
	{ pn: 'FCS-S3', kind: 'schottky', pkg: 'SOD-523', vr: '30', ifa: '200', tj: '125', tags: 'fast clamp', truth: { IS: 2e-8, N: 1.04, RS: 2, RSH: 2e8 } },
	{ pn: 'FCS-J2', kind: 'jfet-gate', pkg: 'SOT-23', vr: '25', ifa: '10', tj: '150', tags: 'gate clamp', truth: { IS: 5e-16, N: 1.05, RS: 20, RSH: 1e13 } }
];
const TEMPS = [25, 55, 85];
const fmt = (x: number) => Number(x.toPrecision(6)).toString();

function sweep(p: (typeof PARTS)[number], T: number, truth: typeof p.truth): string {
	const base = createModel({ ...truth, TNOM: 25 }, engineMaterial(DEFAULT_MATERIAL[p.kind]));
	const model = scaleModel(base, T);
	const rows: string[] = [];
	if (T === 25) {
		const vMax = Math.min(10, 0.5 * Number(p.vr));
		for (let k = 0; k < 12; k++) {
			const v = -vMax + (vMax * k) / 12;
			rows.push(`${fmt(v)},${fmt(currentAtBias(model, v) * (1 + 0.01 * gauss()) + 3e-15 * gauss())}`);
		}
	}
	const iHi = Math.min(0.3 * Number(p.ifa) * 1e-3, 0.05);
	const iLo = Math.min(Math.max(1e-9, 30 * saturationCurrentAt(base, T)), iHi / 1000);
	for (let k = 0; k <= 30; k++) {
		const i = iLo * (iHi / iLo) ** (k / 30);
		rows.push(`${fmt(voltageAtCurrent(model, i) + 1.5e-4 * gauss())},${fmt(i * (1 + 0.001 * gauss()))}`);
	}
	return 'V (V),I (A)\n' + rows.join('\n') + '\n';
}

export function generate(): number {
	mkdirSync(DIR, { recursive: true });
	for (const f of readdirSync(DIR)) rmSync(DIR + f);
	const list = ['Part number,Maker,Kind,Package,Reverse voltage (V),Forward current (mA),Tj max (°C),Tags,Lifecycle'];
	const zip: Record<string, Uint8Array> = {};
	for (const p of PARTS) {
		list.push([p.pn, MAKER, p.kind, p.pkg, p.vr, p.ifa, p.tj, `"${p.tags}"`, 'in-use'].join(','));
		for (let s = 1; s <= 3; s++) {
			const truth = { IS: p.truth.IS * Math.exp(0.3 * gauss()), N: p.truth.N * (1 + 0.005 * gauss()), RS: p.truth.RS * (1 + 0.08 * gauss()), RSH: p.truth.RSH * Math.exp(0.7 * gauss()) };
			for (const T of TEMPS) {
				const name = `${p.pn}_S${s}_${T}C${T === 25 ? '_both' : '_fwd'}.csv`;
				const text = sweep(p, T, truth);
				writeFileSync(DIR + name, text);
				zip[`sweeps/${name}`] = strToU8(text);
			}
		}
	}
	writeFileSync(ROOT + 'parts.csv', list.join('\n') + '\n');
	writeFileSync(ROOT + 'campaign.zip', zipSync(zip, { mtime: new Date('2026-01-01T00:00:00Z') }));
	return Object.keys(zip).length;
}

if (import.meta.url === `file://${process.argv[1]}`) console.log(`${generate()} sweep files written to ${DIR}, with parts.csv and campaign.zip`);
