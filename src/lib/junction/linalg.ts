/**
 * Small dense linear algebra for the fitter (3–4 parameters): solving normal
 * equations and inverting J^T·J. Gauss–Jordan elimination with partial pivoting.
 */

/**
 * Invert a small symmetric or general square matrix given as row arrays.
 * @throws RangeError when the matrix is singular to working precision.
 */
export function invert(a: number[][]): number[][] {
	const n = a.length;
	const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
	for (let c = 0; c < n; c++) {
		let p = c;
		for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
		const pivot = m[p][c];
		if (!Number.isFinite(pivot) || Math.abs(pivot) < 1e-300) throw new RangeError('matrix is singular');
		[m[c], m[p]] = [m[p], m[c]];
		for (let j = 0; j < 2 * n; j++) m[c][j] /= pivot;
		for (let r = 0; r < n; r++) {
			if (r === c) continue;
			const f = m[r][c];
			if (f === 0) continue;
			for (let j = 0; j < 2 * n; j++) m[r][j] -= f * m[c][j];
		}
	}
	return m.map((row) => row.slice(n));
}

/**
 * Least-squares solution of X·b ≈ y (columns given as arrays) via normal equations
 * with column scaling, which is adequate for the 2–3 well-separated columns used here.
 * @throws RangeError when the columns are linearly dependent.
 */
export function leastSquares(columns: ArrayLike<number>[], y: ArrayLike<number>): number[] {
	const p = columns.length;
	const n = y.length;
	const scale = columns.map((c) => {
		let s = 0;
		for (let k = 0; k < n; k++) s = Math.max(s, Math.abs(c[k]));
		return s > 0 ? s : 1;
	});
	const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
	const aty = new Array<number>(p).fill(0);
	for (let k = 0; k < n; k++) {
		for (let i = 0; i < p; i++) {
			const xi = columns[i][k] / scale[i];
			aty[i] += xi * y[k];
			for (let j = i; j < p; j++) ata[i][j] += xi * (columns[j][k] / scale[j]);
		}
	}
	for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) ata[i][j] = ata[j][i];
	const inv = invert(ata);
	return inv.map((row, i) => row.reduce((s, v, j) => s + v * aty[j], 0) / scale[i]);
}

/**
 * Two-sided 95 % Student t quantile t(0.975, df). Values for df ≤ 30 from standard
 * statistical tables (e.g. NIST/SEMATECH e-Handbook of Statistical Methods, Table 1.3.6.7.2);
 * above 30 the approximation 1.96 + 2.4/df (within 0.3 %, checked against those tables).
 * @throws RangeError for df < 1.
 */
export function tQuantile975(df: number): number {
	if (!(df >= 1)) throw new RangeError(`degrees of freedom must be ≥ 1, got ${df}`);
	const table = [
		12.706, 4.303, 3.182, 2.776, 2.571, 2.447, 2.365, 2.306, 2.262, 2.228, 2.201, 2.179, 2.16, 2.145, 2.131, 2.12, 2.11,
		2.101, 2.093, 2.086, 2.08, 2.074, 2.069, 2.064, 2.06, 2.056, 2.052, 2.048, 2.045, 2.042
	];
	const d = Math.floor(df);
	if (d <= 30) return table[d - 1];
	return 1.96 + 2.4 / d;
}
