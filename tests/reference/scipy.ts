/**
 * Run Debian's SciPy (python3-scipy, /usr/bin/python3) from tests as a reference
 * statistics library: a short script reads JSON arguments on standard input and prints
 * JSON. Installed by scripts/test.sh through ensure_debian_packages.
 */
import { execFileSync } from 'node:child_process';

export const DEBIAN_PYTHON = '/usr/bin/python3';

/**
 * The γ-quantiles of the noncentral t for each [gamma, df, delta] triple, from
 * scipy.stats.nct.ppf (Boost's non_central_t in Debian's SciPy 1.10).
 */
export function scipyNoncentralTQuantiles(cases: [number, number, number][]): number[] {
	return runPython(
		'import json, sys\nfrom scipy.stats import nct\nprint(json.dumps([float(nct.ppf(g, df, d)) for g, df, d in json.load(sys.stdin)]))',
		cases
	) as number[];
}

/** F(t; ν, δ) for each [t, df, delta] triple, from scipy.stats.nct.cdf. */
export function scipyNoncentralTCdf(cases: [number, number, number][]): number[] {
	return runPython(
		'import json, sys\nfrom scipy.stats import nct\nprint(json.dumps([float(nct.cdf(t, df, d)) for t, df, d in json.load(sys.stdin)]))',
		cases
	) as number[];
}

/** The standard normal quantile z_p for each p, from scipy.stats.norm.ppf. */
export function scipyNormalQuantiles(ps: number[]): number[] {
	return runPython('import json, sys\nfrom scipy.stats import norm\nprint(json.dumps([float(norm.ppf(p)) for p in json.load(sys.stdin)]))', ps) as number[];
}

/** Student t quantiles for each [p, df] pair, from scipy.stats.t.ppf. */
export function scipyTQuantiles(cases: [number, number][]): number[] {
	return runPython('import json, sys\nfrom scipy.stats import t\nprint(json.dumps([float(t.ppf(p, df)) for p, df in json.load(sys.stdin)]))', cases) as number[];
}

/** The least-squares solution of X·b ≈ y (X given as its columns), from numpy.linalg.lstsq (LAPACK gelsd, SVD). */
export function numpyLeastSquares(columns: number[][], y: number[]): number[] {
	return runPython(
		'import json, sys\nimport numpy as np\nc, y = json.load(sys.stdin)\nb = np.linalg.lstsq(np.array(c).T, np.array(y), rcond=None)[0]\nprint(json.dumps([float(v) for v in b]))',
		[columns, y]
	) as number[];
}

/** The inverse of a square matrix, from numpy.linalg.inv (LAPACK gesv). */
export function numpyInverse(a: number[][]): number[][] {
	return runPython('import json, sys\nimport numpy as np\nprint(json.dumps(np.linalg.inv(np.array(json.load(sys.stdin))).tolist()))', a) as number[][];
}

function runPython(script: string, input: unknown): unknown {
	try {
		const out = execFileSync(DEBIAN_PYTHON, ['-W', 'ignore', '-c', script], { input: JSON.stringify(input), encoding: 'utf8' });
		return JSON.parse(out);
	} catch (e) {
		const err = e as { message: string; stderr?: string };
		throw new Error(`SciPy reference failed (is python3-scipy installed?): ${err.message}\n${err.stderr ?? ''}`);
	}
}
