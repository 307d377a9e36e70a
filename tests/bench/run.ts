/**
 * Benchmark entry point (`npm run bench`). Each area adds its own call here; the report is
 * written from every recorded result at the end.
 */
import { runJunctionBenchmarks } from './junction.bench';
import { writeReport } from './results';

await runJunctionBenchmarks();
console.log('\n' + writeReport());
