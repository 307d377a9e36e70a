/** Which runs and points an I–V fit can use: forward points, the reasons a run cannot be fitted, a left-out window. */
import type { SweepRun } from './csv';

/** The run's forward-bias points with positive current, in sweep order. */
export function forwardPoints(run: SweepRun): { I: number[]; V: number[] } {
	const I: number[] = [];
	const V: number[] = [];
	for (let k = 0; k < run.voltageV.length; k++) {
		if (run.voltageV[k] > 0 && run.currentA[k] > 0) {
			I.push(run.currentA[k]);
			V.push(run.voltageV[k]);
		}
	}
	return { I, V };
}

/** Reasons a run cannot support a fit (empty when it can). */
export function checkRun(run: SweepRun, minPoints: number, minDecades: number): string[] {
	const reasons: string[] = [];
	const at = `at ${run.temperatureC.toFixed(1)} °C`;
	let fwd = 0;
	let wrong = 0;
	for (let k = 0; k < run.voltageV.length; k++) {
		if (run.voltageV[k] > 0) {
			fwd++;
			if (run.currentA[k] < 0) wrong++;
		}
	}
	if (fwd > 0 && wrong * 2 > fwd)
		return [`${at}: current is negative at forward bias in ${wrong} of ${fwd} points (wrong sign; swap the leads or the sign convention)`];
	if (fwd === 0) {
		let revWrong = 0;
		let rev = 0;
		for (let k = 0; k < run.voltageV.length; k++)
			if (run.voltageV[k] < 0) {
				rev++;
				if (run.currentA[k] > 0) revWrong++;
			}
		if (rev > 0 && revWrong * 2 > rev)
			return [`${at}: current is positive at reverse bias (wrong sign), and there are no forward-bias points`];
		return [`${at}: no forward-bias points; IS and N need a forward sweep`];
	}
	const { I, V } = forwardPoints(run);
	if (I.length < minPoints) reasons.push(`${at}: too few forward points (${I.length}; need at least ${minPoints})`);
	if (I.length >= 2) {
		const lo = Math.min(...I);
		const hi = Math.max(...I);
		const decades = Math.log10(hi / lo);
		if (decades < minDecades)
			reasons.push(`${at}: forward current spans ${decades.toFixed(2)} decades; need at least ${minDecades}`);
		let drops = 0;
		let bigDrop = false;
		for (let k = 1; k < I.length; k++) {
			if (V[k] > V[k - 1] && I[k] < 0.9 * I[k - 1]) {
				drops++;
				if (I[k] < 0.5 * I[k - 1]) bigDrop = true;
			}
		}
		if (bigDrop || drops > Math.max(1, 0.05 * I.length))
			reasons.push(`${at}: forward current is not monotonic in voltage (${drops} drops); check for range switching or heating`);
	}
	return reasons;
}

/** The runs without the merged points whose voltage lies in [lo, hi], and how many raw points those held. */
export function excludeWindow(runs: SweepRun[], [lo, hi]: [number, number]): { runs: SweepRun[]; excluded: number } {
	if (!Number.isFinite(lo) || !Number.isFinite(hi) || lo > hi) throw new RangeError(`excludeV must be a finite [lo, hi] with lo ≤ hi, got [${lo}, ${hi}]`);
	let excluded = 0;
	const out = runs.map((r) => {
		const keep: number[] = [];
		for (let k = 0; k < r.voltageV.length; k++) {
			if (r.voltageV[k] < lo || r.voltageV[k] > hi) keep.push(k);
			else excluded += r.count[k];
		}
		return {
			...r,
			voltageV: Float64Array.from(keep, (k) => r.voltageV[k]),
			currentA: Float64Array.from(keep, (k) => r.currentA[k]),
			count: Int32Array.from(keep, (k) => r.count[k]),
			points: keep.reduce((a, k) => a + r.count[k], 0)
		};
	});
	return { runs: out, excluded };
}
