/**
 * Run ngspice (Debian package, /usr/bin/ngspice) in batch mode from tests and
 * read back vector values printed with full precision.
 *
 * Facts about ngspice 39 this helper relies on:
 *  - batch mode exits non-zero unless the control block ends with `quit 0`;
 *  - `set numdgt=17` makes `print` write doubles with enough digits to compare at 1e-9;
 *  - `.option gmin=0` removes the 1e-12 S conductance it otherwise adds across junctions;
 *  - `wrdata` with `set wr_singlescale` writes a sweep as two columns, swept value and expression.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export const NGSPICE = '/usr/bin/ngspice';

export interface NgspiceRun {
	/** Netlist lines (elements, .model cards, .temp/.options) without title, control block or .end. */
	netlist: string;
	/** Expressions to print after the operating point, e.g. `@d1[id]` or `v(a)`. */
	prints: string[];
	/** Extra `.option` text; defaults to `gmin=0 reltol=1e-8`. */
	options?: string;
}

/** Values keyed by the printed expression, lower-cased as ngspice prints them. */
export type NgspiceValues = Map<string, number>;

/**
 * Write a deck (title, netlist, options, a control block ending in `quit 0`) to a temporary
 * folder, run `ngspice -b -n deck.cir` there, and hand its printed output and the folder to
 * `read` before the folder is removed. Throws with ngspice's output on failure.
 */
function runDeck<T>(netlist: string, options: string | undefined, control: string[], read: (out: string, dir: string) => T): T {
	const dir = mkdtempSync(join(tmpdir(), 'junction-ngspice-'));
	try {
		const deck = [
			'* junction engine reference deck',
			netlist,
			`.option ${options ?? 'gmin=0 reltol=1e-8'}`,
			'.control',
			'set numdgt=17',
			...control,
			'quit 0',
			'.endc',
			'.end',
			''
		].join('\n');
		writeFileSync(join(dir, 'deck.cir'), deck);
		let out: string;
		try {
			out = execFileSync(NGSPICE, ['-b', '-n', 'deck.cir'], {
				cwd: dir,
				encoding: 'utf8',
				maxBuffer: 64 * 1024 * 1024,
				stdio: ['ignore', 'pipe', 'pipe']
			});
		} catch (e) {
			const err = e as { stdout?: string; stderr?: string; message: string };
			throw new Error(`ngspice failed: ${err.message}\n${err.stdout ?? ''}\n${err.stderr ?? ''}`);
		}
		return read(out, dir);
	} finally {
		rmSync(dir, { recursive: true, force: true });
	}
}

/**
 * Run the operating point of a deck and parse the `name = value` lines it prints.
 * Throws with ngspice's output on failure or when a requested expression is missing.
 */
export function runNgspiceOp(run: NgspiceRun): NgspiceValues {
	return runDeck(run.netlist, run.options, ['op', ...run.prints.map((p) => `print ${p}`)], (out) => {
		const values: NgspiceValues = new Map();
		for (const line of out.split('\n')) {
			const m = /^\s*(\S+)\s+=\s+([-+0-9.eE]+)\s*$/.exec(line);
			if (m) values.set(m[1].toLowerCase(), Number(m[2]));
		}
		for (const p of run.prints) {
			if (!values.has(p.toLowerCase())) throw new Error(`ngspice did not print ${p}\n${out.slice(0, 4000)}`);
		}
		return values;
	});
}

export interface NgspiceDcSweep {
	/** Netlist lines as for `runNgspiceOp`. */
	netlist: string;
	/** The independent source swept, e.g. `vsig`. */
	source: string;
	start: number;
	stop: number;
	step: number;
	/** One expression recorded at each sweep point, e.g. `i(vsig)`. */
	expression: string;
	options?: string;
}

/**
 * A DC sweep (`dc source start stop step`) with one expression written by `wrdata` at full
 * precision; returns the sweep points as { x: swept value, y: expression }.
 */
export function runNgspiceDc(run: NgspiceDcSweep): { x: number; y: number }[] {
	const control = ['set wr_singlescale', `dc ${run.source} ${run.start} ${run.stop} ${run.step}`, `wrdata sweep.txt ${run.expression}`];
	return runDeck(run.netlist, run.options, control, (out, dir) => {
		let text: string;
		try {
			text = readFileSync(join(dir, 'sweep.txt'), 'utf8');
		} catch {
			throw new Error(`ngspice wrote no sweep\n${out.slice(0, 4000)}`);
		}
		const rows = text
			.split('\n')
			.map((l) => l.trim().split(/\s+/).map(Number))
			.filter((r) => r.length === 2 && r.every(Number.isFinite));
		if (rows.length === 0) throw new Error(`ngspice's sweep is empty\n${text.slice(0, 2000)}`);
		return rows.map(([x, y]) => ({ x, y }));
	});
}

/** True when the ngspice binary is present (tests assume it; this gives a clear failure message). */
export function ngspiceAvailable(): boolean {
	try {
		execFileSync(NGSPICE, ['--version'], { stdio: 'ignore' });
		return true;
	} catch {
		return false;
	}
}

/** gmin=0 (no conductance across junctions); abstol and vntol far below the femtoamp currents compared. */
export const PRECISE_OPTIONS = 'gmin=0 reltol=1e-10 abstol=1e-28 vntol=1e-15';

/**
 * The current into an exported SPICE block (a `.subckt NAME anode cathode` or a plain
 * `.model NAME D`) at each bias, at one circuit temperature (`.temp`), read as the sum of
 * the devices across the junction (diode, shunt resistor `Rsh`, recombination source
 * `Brec`): through RS the source's branch current is only as good as the node voltages'
 * last digits ÷ RS. ngspice's GMIN is set to zero here, in the test deck.
 */
export function blockCurrents(block: string, temperatureC: number, biasesV: number[]): number[] {
	const sub = /^\.subckt (\S+)/m.exec(block)?.[1];
	const model = /^\.model (\S+) D/im.exec(block)?.[1];
	if (!sub && !model) throw new Error(`no .subckt or diode .model in\n${block}`);
	const lines = [block, `.temp ${temperatureC}`];
	const devices: string[][] = [];
	biasesV.forEach((v, k) => {
		lines.push(`v${k} n${k} 0 dc ${v}`);
		if (sub) {
			lines.push(`x${k} n${k} 0 ${sub}`);
			devices.push([
				`@d.x${k}.d1[id]`,
				...(/^Rsh /m.test(block) ? [`@r.x${k}.rsh[i]`] : []),
				...(/^Brec /m.test(block) ? [`@b.x${k}.brec[i]`] : [])
			]);
		} else {
			lines.push(`d${k} n${k} 0 ${model}`);
			devices.push([`@d${k}[id]`]);
		}
	});
	const got = runNgspiceOp({ netlist: lines.join('\n'), prints: devices.flat(), options: PRECISE_OPTIONS });
	return devices.map((ds) => ds.reduce((sum, d) => sum + got.get(d.toLowerCase())!, 0));
}
