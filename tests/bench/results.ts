/**
 * Benchmark result store: merges entries into tests/bench/results.json, replacing by name.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { cpus, platform, release, totalmem } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export interface BenchResult {
	name: string;
	/** Measured time ratio (candidate / baseline); lower is better. */
	ratio: number;
	/** Ratio the candidate should stay at or below. */
	target: number;
	detail: string;
}

const FILE = join(dirname(fileURLToPath(import.meta.url)), 'results.json');

/** Record one result, replacing any earlier entry of the same name. */
export function record(name: string, ratio: number, target: number, detail: string): void {
	let results: BenchResult[] = [];
	if (existsSync(FILE)) {
		try {
			const parsed = JSON.parse(readFileSync(FILE, 'utf8')) as { results?: BenchResult[] };
			results = Array.isArray(parsed.results) ? parsed.results : [];
		} catch {
			results = [];
		}
	}
	results = results.filter((r) => r.name !== name);
	results.push({ name, ratio, target, detail });
	writeFileSync(FILE, JSON.stringify({ results }, null, 2) + '\n');
}

/** What this machine is, for the report's heading. */
function machine(): string {
	const cpu = cpus()[0]?.model ?? 'unknown CPU';
	return `${cpus().length} × ${cpu}, ${(totalmem() / 2 ** 30).toFixed(0)} GiB, Node.js ${process.version}, ${platform()} ${release()}`;
}

/**
 * Writes tests/bench/REPORT.md from results.json: one row per result, measured ratio
 * against its target. Targets are upper bounds on a time ratio, except for the results
 * where bigger is better (rates, and how many times slower an alternative is).
 */
export function writeReport(): string {
	const { results = [] } = existsSync(FILE) ? (JSON.parse(readFileSync(FILE, 'utf8')) as { results?: BenchResult[] }) : {};
	const meets = (r: BenchResult) => (isLowerBound(r) ? r.ratio >= r.target : r.ratio <= r.target);
	const lines = [
		'# Benchmark report',
		'',
		`Measured by \`npm run bench\` on ${new Date().toISOString().slice(0, 10)}; machine: ${machine()}.${process.env.BENCH_NOTE ? ` ${process.env.BENCH_NOTE}` : ''}`,
		'Each ratio compares two measurements taken in the same run, so it travels between machines better than a time does.',
		'',
		'| benchmark | ratio | target | meets | detail |',
		'|---|---:|---:|:-:|---|',
		...results.map(
			(r) =>
				`| ${r.name} | ${r.ratio.toPrecision(3)} | ${isLowerBound(r) ? '≥' : '≤'} ${r.target} | ${meets(r) ? 'yes' : '**no**'} | ${r.detail.replace(/\|/g, '\\|')} |`
		),
		''
	];
	const text = lines.join('\n');
	writeFileSync(join(dirname(FILE), 'REPORT.md'), text);
	return text;
}

// Results where bigger is better (rates); every other ratio is a time ratio, smaller is better.
const HIGHER_IS_BETTER = new Set(['browser-rerank-per-s']);

function isLowerBound(r: BenchResult): boolean {
	return HIGHER_IS_BETTER.has(r.name) || /per-s$/.test(r.name);
}
