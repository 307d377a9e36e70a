/**
 * Benchmark entry point (`npm run bench`, through scripts/bench.sh, which sets up the stack).
 * Each area adds its own call here; the report is written from every recorded result.
 */
import { runJunctionBenchmarks } from './junction.bench';
import { runLoadBenchmarks } from './load';
import { writeReport } from './results';

await runJunctionBenchmarks();
if (process.env.APP_URL) {
	await runLoadBenchmarks();
	const { client } = await import('../../src/lib/server/db');
	await client.end();
}
console.log('\n' + writeReport());
