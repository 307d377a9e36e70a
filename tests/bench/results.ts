/**
 * Benchmark result store: merges entries into tests/bench/results.json, replacing by name.
 */
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
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
