// npm run db:verify: recomputes every job's hash chain in the database and names the first
// entry where a chain breaks (src/lib/server/chain-verify.ts). Exits 1 when any chain is broken.
// DATABASE_URL, or the project's own database (`--db NAME` for another one of the cluster).
import postgres from 'postgres';
import { databaseUrl } from './lib/config.js';
import { verifyChains } from '../src/lib/server/chain-verify';

const i = process.argv.indexOf('--db');
const url =
	i > 0 && process.argv[i + 1]
		? databaseUrl(process.argv[i + 1])
		: (process.env.DATABASE_URL ?? databaseUrl());
const sql = postgres(url, { max: 2, onnotice: () => {} });
try {
	const report = await verifyChains(sql);
	console.log(
		`Checked ${report.entries} entries in ${report.jobs} job logs in ${(report.ms / 1000).toFixed(2)} s.`
	);
	if (report.breaks.length === 0) {
		console.log('Every chain is whole: each entry matches its hash and links to the one before.');
	} else {
		console.log(`${report.breaks.length} broken chain(s):`);
		for (const b of report.breaks) {
			const where = b.entryId
				? `entry ${b.pos} (${b.entryId}, “${b.rawText ?? ''}”)`
				: `after entry ${(b.pos ?? 1) - 1}`;
			console.log(
				`  job ${b.jobNumber ?? '?'} (${b.jobId}) shop ${b.shopId}: ${where}: ${b.message}`
			);
		}
		process.exitCode = 1;
	}
} catch (err) {
	console.error(`Could not verify: ${err instanceof Error ? err.message : String(err)}`);
	process.exitCode = 2;
} finally {
	await sql.end({ timeout: 2 });
}
