/**
 * Benchmark entry point (`npm run bench`, through scripts/bench.sh, which sets up the stack:
 * its own PostgreSQL, the demo scaled to 10k parts, the built server). Each area adds its
 * own call here; the report is written from every recorded result at the end.
 * BENCH_ONLY=ranking,browser (a comma list of the areas below) runs only those areas.
 */
import { runBrowserBenchmarks } from './browser.bench';
import { runCampaignBenchmark } from './campaign.bench';
import { runJunctionBenchmarks } from './junction.bench';
import { runLoadBenchmarks } from './load';
import { runRankingBenchmarks } from './ranking.bench';
import { runSearchBenchmarks } from './search.bench';
import { runSnapshotBenchmarks } from './snapshot.bench';
import { writeReport } from './results';

const only = process.env.BENCH_ONLY?.split(',').map((s) => s.trim());
const wanted = (area: string) => !only || only.includes(area);

if (wanted('junction')) await runJunctionBenchmarks();
if (wanted('search')) await runSearchBenchmarks();
if (wanted('snapshot')) await runSnapshotBenchmarks();
if (process.env.DATABASE_URL) {
	if (wanted('ranking')) await runRankingBenchmarks();
	if (wanted('browser')) await runBrowserBenchmarks();
	if (wanted('campaign')) await runCampaignBenchmark();
	if (wanted('load')) await runLoadBenchmarks();
	const { client } = await import('../../src/lib/server/db');
	await client.end();
}
console.log('\n' + writeReport());
