// npm run dev: the Vite dev server against the same local cluster and database.
import { join } from 'node:path';
import { config, root } from './lib/config.js';
import { ensurePackages, prepareDatabase } from './lib/prepare.js';
import { run } from './lib/run.js';

await ensurePackages();
const url = await prepareDatabase(config.dbName);
const code = await run(
	join(root, 'node_modules', '.bin', 'vite'),
	['dev', '--port', String(config.appPort), ...process.argv.slice(2)],
	{
		env: { ...process.env, DATABASE_URL: url, BENCHCALL_UPLOADS_DIR: config.uploadsDir }
	}
);
process.exit(code);
