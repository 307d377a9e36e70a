// The demo's C–V sweeps: an LCR meter's capacitance readings against reverse bias for two or
// three samples of most parts, generated from invented depletion parameters (CJO, VJ, M in the
// ranges such junctions have) with their own seeded generator, so the I–V files stay as they
// are. Readings carry 0.2 % + 2 fF of meter noise; some files include the fixture's 0.25 pF,
// which the manifest records as the stray capacitance to subtract.
import { writeFileSync } from 'node:fs';
import { depletionCapacitanceAt } from '../../src/lib/junction';
import { gaussian, mulberry32 } from '../../src/lib/random';
import type { DemoPart } from './parts';

export type CvManifestEntry = {
	file: string;
	part: string;
	sample: string;
	lot: string;
	dateCode: string;
	temperatureC: number;
	measurement: 'cv';
	/** Fixture capacitance included in the readings [F]. */
	strayCapacitanceF?: number;
	/** Test-signal settings when the file has no column for them. */
	frequencyHz?: number;
	testLevelV?: number;
};

const rand = mulberry32(20240923);
const gauss = gaussian(rand);

/** Invented typical depletion parameters by kind (CJO in F, VJ in V, M): small-signal parts of a few pF, rectifiers, Schottkys and LEDs tens of pF. */
function typicalFor(p: DemoPart): { CJO: number; VJ: number; M: number } {
	const power = p.tags.some((t) => t === 'rectifier' || t === 'power');
	switch (p.kind) {
		case 'schottky':
			return { CJO: power ? 80e-12 : 12e-12, VJ: 0.45, M: 0.45 };
		case 'bjt-be':
		case 'bjt-diode':
			return { CJO: 8e-12, VJ: 0.75, M: 0.33 };
		case 'jfet-gate':
			return { CJO: 5e-12, VJ: 0.6, M: 0.4 };
		case 'led':
			return { CJO: 30e-12, VJ: 1.5, M: 0.4 };
		default:
			return power ? { CJO: 40e-12, VJ: 0.65, M: 0.45 } : { CJO: 2.5e-12, VJ: 0.72, M: 0.33 };
	}
}

const FIXTURE_F = 0.25e-12;
const fmt = (x: number) => Number(x.toPrecision(5)).toString();

function write(style: number, rows: { v: number; c: number }[]): string {
	if (style === 1) {
		// Reverse bias only, as magnitudes; semicolons, decimal commas, picofarads; the meter's settings as columns.
		const c = (x: number) => fmt(x).replace('.', ',');
		const reverse = rows.filter((r) => r.v <= 0);
		return 'VR (V);Cp [pF];Freq (kHz);Level (mV)\n' + reverse.map((r) => `${c(-r.v || 0)};${c(r.c * 1e12)};1000;30`).join('\n') + '\n';
	}
	if (style === 2) return 'Bias (V),Capacitance (F),Temp (°C)\n' + rows.map((r) => `${fmt(r.v)},${fmt(r.c)},25`).join('\n') + '\n';
	return 'V (V),C (pF)\n' + rows.map((r) => `${fmt(r.v)},${fmt(r.c * 1e12)}`).join('\n') + '\n';
}

/** Writes the C–V files for the parts measured on two or more samples (up to three each) and returns their manifest entries. */
export function writeCapacitanceSweeps(dir: string, parts: DemoPart[], lotOf: (p: DemoPart, s: number) => { lot: string; dateCode: string }): CvManifestEntry[] {
	const out: CvManifestEntry[] = [];
	let fileNo = 0;
	for (const p of parts) {
		if (p.samples < 2 || p.lifecycle === 'retired') continue;
		const t = typicalFor(p);
		const partCjo = t.CJO * Math.exp(0.3 * gauss());
		const vMax = Math.min(10, 0.5 * (p.ratings.reverseV ?? 5));
		for (let s = 1; s <= Math.min(3, p.samples); s++) {
			const unit = { CJO: partCjo * (1 + 0.04 * gauss()), VJ: t.VJ * (1 + 0.02 * gauss()), M: t.M * (1 + 0.02 * gauss()), FC: 0.5 };
			const withFixture = fileNo % 3 === 0;
			const rows = Array.from({ length: 22 }, (_, k) => -vMax + ((vMax + 0.3) * k) / 21).map((v) => ({
				v: Number(v.toFixed(4)),
				c: depletionCapacitanceAt(unit, v) * (1 + 0.002 * gauss()) + 2e-15 * gauss() + (withFixture ? FIXTURE_F : 0)
			}));
			const style = fileNo++ % 3;
			const file = `${p.key}_U${s}_25C_cv.csv`;
			writeFileSync(dir + file, write(style, rows));
			out.push({
				file,
				part: p.key,
				sample: `U${s}`,
				...lotOf(p, s),
				temperatureC: 25,
				measurement: 'cv',
				...(withFixture ? { strayCapacitanceF: FIXTURE_F } : {}),
				...(style !== 1 ? { frequencyHz: 1e6, testLevelV: 0.03 } : {})
			});
		}
	}
	return out;
}
