/**
 * The fitters' linear algebra (2–4 parameters), on ml-matrix and @stdlib rather than by hand.
 *
 * Least squares forms the small normal equations in one streaming pass over the points and
 * solves them by SVD: a sweep holds up to 10⁵ points, and a dense QR of the whole design
 * matrix costs far more (measured here: ≈200 ms against ≈1 ms at 10⁵ × 3), while the
 * columns the fitters use (ln I, I, 1; 1/T, 1; V, 1), each scaled to unit size, are few and
 * well conditioned. linalg.spec.ts checks the answers against numpy's lstsq.
 */
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import tQuantile from '@stdlib/stats-base-dists-t-quantile';

/**
 * The SVD of a symmetric matrix with a unit diagonal, refused when it is singular to working
 * precision (smallest singular value under machine epsilon times the largest).
 */
function trustedSvd(m: Matrix, refusal: string): SingularValueDecomposition {
	const svd = new SingularValueDecomposition(m, { autoTranspose: true });
	const s = svd.diagonal;
	if (!s.every(Number.isFinite) || !(Math.min(...s) > Number.EPSILON * Math.max(...s))) throw new RangeError(refusal);
	return svd;
}

/** D·A·D with D = diag(1/√aᵢᵢ): the unit-diagonal form of a positive (semi)definite matrix, and D. */
function unitDiagonal(a: Matrix, refusal: string): { scaled: Matrix; d: number[] } {
	const d = Array.from({ length: a.rows }, (_, i) => {
		const v = a.get(i, i);
		if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(refusal);
		return 1 / Math.sqrt(v);
	});
	return { scaled: Matrix.from1DArray(a.rows, a.columns, a.to1DArray().map((v, k) => v * d[Math.floor(k / a.columns)] * d[k % a.columns])), d };
}

/**
 * Inverse of a fitter's JᵀJ (symmetric, positive definite when the data determine every
 * parameter), for the covariance of the fitted parameters.
 * @throws RangeError when it is singular to working precision.
 */
export function invert(jtj: number[][]): number[][] {
	const refusal = 'matrix is singular';
	const { scaled, d } = unitDiagonal(new Matrix(jtj), refusal);
	const inv = trustedSvd(scaled, refusal).inverse();
	return inv.to2DArray().map((row, i) => row.map((v, j) => v * d[i] * d[j]));
}

/**
 * Least-squares solution b of X·b ≈ y, X given as its columns.
 * @throws RangeError when the columns are linearly dependent.
 */
export function leastSquares(columns: ArrayLike<number>[], y: ArrayLike<number>): number[] {
	const refusal = 'columns are linearly dependent';
	const p = columns.length;
	const n = y.length;
	const ata = Array.from({ length: p }, () => new Array<number>(p).fill(0));
	const aty = new Array<number>(p).fill(0);
	for (let k = 0; k < n; k++) {
		for (let i = 0; i < p; i++) {
			const xi = columns[i][k];
			aty[i] += xi * y[k];
			for (let j = i; j < p; j++) ata[i][j] += xi * columns[j][k];
		}
	}
	for (let i = 0; i < p; i++) for (let j = 0; j < i; j++) ata[i][j] = ata[j][i];
	const { scaled, d } = unitDiagonal(new Matrix(ata), refusal);
	const rhs = Matrix.columnVector(aty.map((v, i) => v * d[i]));
	return trustedSvd(scaled, refusal)
		.solve(rhs)
		.to1DArray()
		.map((v, i) => v * d[i]);
}

/**
 * The two-sided 95 % Student t quantile t(0.975, df), exact (@stdlib; linalg.spec.ts checks
 * it against published table values and SciPy). Fractional df are taken down to a whole number.
 * @throws RangeError for df < 1.
 */
export function tQuantile975(df: number): number {
	if (!(df >= 1)) throw new RangeError(`degrees of freedom must be ≥ 1, got ${df}`);
	return tQuantile(0.975, Math.floor(df));
}
