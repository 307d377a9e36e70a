/**
 * Benchmark entry point (`npm run bench`). Each area adds its own call here.
 */
import { runJunctionBenchmarks } from './junction.bench';

await runJunctionBenchmarks();
