// npm run db:start | db:stop | db:status | db:migrate | db:seed
import { config, databaseUrl } from './lib/config.js';
import { findPgBin, isRunning, startCluster, stopCluster } from './lib/pg.js';
import { ensurePackages, prepareDatabase, seed } from './lib/prepare.js';

const command = process.argv[2];

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
	default:
		console.error('usage: node scripts/db.js start|stop|status|migrate|seed');
		process.exit(2);
}
