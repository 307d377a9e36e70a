// Records the long property-based run of the hostile-input suite (bench.sh runs it with
// FUZZ_RUNS cases per endpoint) as a benchmark result: failures over properties, target 0.
import { readFileSync } from 'node:fs';
import { record, writeReport } from './results';

const [file, runs] = process.argv.slice(2);
const report = JSON.parse(readFileSync(file, 'utf8')) as { numTotalTests: number; numFailedTests: number; numPassedTests: number };
const properties = 11; // ten JSON endpoints and the CSV upload property
record(
	'hostile-input-failures',
	report.numFailedTests / Math.max(1, report.numTotalTests),
	0,
	`${Number(runs) * properties} generated bodies (${runs} per property, fast-check) plus injection, oversize and cut-off cases: ${report.numPassedTests} of ${report.numTotalTests} checks passed (never a 5xx, nothing written on refusal)`
);
console.log('\n' + writeReport());
