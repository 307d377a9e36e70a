// Sums the JSON reports of vitest and Playwright into one closing line.
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';

const dir = process.argv[2];
let passed = 0;
let failed = 0;
let skipped = 0;

for (const name of ['unit.json', 'integration.json', 'faults.json']) {
	const file = join(dir, name);
	if (!existsSync(file)) {
		console.log(`${name}: no report (the run did not finish)`);
		failed += 1;
		continue;
	}
	const r = JSON.parse(readFileSync(file, 'utf8'));
	passed += r.numPassedTests;
	failed += r.numFailedTests + (r.success || r.numFailedTests ? 0 : 1);
	skipped += r.numPendingTests + r.numTodoTests;
}

const e2e = join(dir, 'e2e.json');
if (existsSync(e2e)) {
	const s = JSON.parse(readFileSync(e2e, 'utf8')).stats;
	passed += s.expected + s.flaky;
	failed += s.unexpected;
	skipped += s.skipped;
} else {
	console.log('e2e.json: no report (the run did not finish)');
	failed += 1;
}

const check = join(dir, 'check.status');
if (!existsSync(check) || readFileSync(check, 'utf8').startsWith('fail')) failed += 1;
else passed += 1;

console.log(`${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(failed ? 1 : 0);
