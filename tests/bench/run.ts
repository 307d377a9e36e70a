/**
 * Benchmark entry point (`npm run bench`, through scripts/bench.sh, which sets up the stack:
 * its own PostgreSQL, the demo scaled to 10k parts, the built server). Each area adds its
 * own call here; the report is written from every recorded result at the end.
 */
import { runBrowserBenchmarks } from './browser.bench';
import { runCampaignBenchmark } from './campaign.bench';
import { runJunctionBenchmarks } from './junction.bench';
import { runLoadBenchmarks } from './load';
import { runRankingBenchmarks } from './ranking.bench';
import { runSearchBenchmarks } from './search.bench';
import { runSnapshotBenchmarks } from './snapshot.bench';
import { writeReport } from './results';

await runJunctionBenchmarks();
await runSearchBenchmarks();
await runSnapshotBenchmarks();
if (process.env.DATABASE_URL) {
	await runRankingBenchmarks();
	await runBrowserBenchmarks();
	await runCampaignBenchmark();
	await runLoadBenchmarks();
	const { client } = await import('../../src/lib/server/db');
	await client.end();
}
console.log('\n' + writeReport());
