// npm run db:start | db:stop | db:status | db:migrate | db:seed | db:rebuild-state [-- --shop ID] | db:audit-distribution
import { config, databaseUrl } from './lib/config.js';
import { findPgBin, isRunning, startCluster, stopCluster } from './lib/pg.js';
import { ensurePackages, prepareDatabase, seed } from './lib/prepare.js';

const command = process.argv[2];

/** The value after a flag such as `--into NAME`, or null. */
function option(flag) {
	const i = process.argv.indexOf(flag);
	return i > 0 && process.argv[i + 1] ? process.argv[i + 1] : null;
}

switch (command) {
	case 'start':
		await startCluster();
		console.log(`DATABASE_URL=${databaseUrl()}`);
		break;
	case 'stop':
		await stopCluster();
		break;
	case 'status': {
		const bin = findPgBin();
		const up = bin !== null && isRunning(bin);
		console.log(up ? `running on 127.0.0.1:${config.pgPort} (${config.pgDir})` : 'not running');
		process.exitCode = up ? 0 : 3;
		break;
	}
	case 'migrate':
		await ensurePackages();
		await prepareDatabase(process.env.BENCHCALL_DB_NAME || config.dbName);
		break;
	case 'seed':
		await ensurePackages();
		await startCluster();
		await seed(databaseUrl(process.env.BENCHCALL_DB_NAME || config.dbName));
		break;
	case 'rebuild-state': {
		await startCluster();
		const { rebuildState } = await import('./lib/rebuild-state.js');
		const n = await rebuildState(
			databaseUrl(process.env.BENCHCALL_DB_NAME || config.dbName),
			option('--shop')
		);
		console.log(`Derived state rebuilt from the log for ${n} shop${n === 1 ? '' : 's'}.`);
		break;
	}
	case 'audit-distribution': {
		await startCluster();
		const { distributionObstacles } = await import('./lib/distribution-audit.js');
		const found = await distributionObstacles(
			databaseUrl(process.env.BENCHCALL_DB_NAME || config.dbName)
		);
		for (const line of found) console.log(`  ${line}`);
		console.log(
			found.length === 0
				? 'Every shop table can be distributed by shop_id.'
				: `${found.length} obstacles to distributing the shop tables by shop_id.`
		);
		break;
	}
	case 'backup': {
		const { backup } = await import('./lib/backup.js');
		await backup(option('--db') ?? config.dbName, option('--out') ?? undefined);
		break;
	}
	case 'restore': {
		const file = process.argv[3];
		if (!file || file.startsWith('--')) {
			console.error('usage: npm run db:restore -- FILE [--into DATABASE]');
			process.exit(2);
		}
		const { restore } = await import('./lib/backup.js');
		try {
			await restore(file, option('--into') ?? config.dbName);
		} catch (err) {
			console.error(err instanceof Error ? err.message : err);
			process.exit(1);
		}
		break;
	}
	default:
		console.error(
			'usage: node scripts/db.js start|stop|status|migrate|seed|rebuild-state|audit-distribution|backup|restore'
		);
		process.exit(2);
}
