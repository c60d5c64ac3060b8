// npm start: install what is missing, start PostgreSQL on 127.0.0.1, migrate, seed the demo
// shop, build, serve, and print the demo sign-ins. Built-ins only until `npm ci` has run.
import { spawn } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { config, root, shutdownTimeout } from './lib/config.js';
import { demoAccounts, demoPassword, otherAccounts } from './lib/demo.js';
import { ensurePackages, prepareDatabase } from './lib/prepare.js';
import { step } from './lib/run.js';

const started = Date.now();
await ensurePackages();
const databaseUrlValue = await prepareDatabase(config.dbName);
const { ensureBuild } = await import('./lib/build.js');
await ensureBuild();
mkdirSync(config.uploadsDir, { recursive: true });

const origin = process.env.ORIGIN || `http://${config.appHost}:${config.appPort}`;
step(
	'Starting the local mail sink and payment provider (unless SMTP_URL / STRIPE_SECRET_KEY are set)'
);
const { startFakes } = await import('./lib/fakes.js');
const fakes = await startFakes({
	appOrigin: `http://${config.appHost}:${config.appPort}`,
	dataDir: config.dataDir,
	smtpPort: config.smtpPort,
	paymentsPort: config.paymentsPort
});
step(`Starting Benchcall on ${origin}`);
const app = spawn(process.execPath, [join(root, 'build', 'index.js')], {
	cwd: root,
	stdio: ['ignore', 'inherit', 'inherit'],
	env: {
		...process.env,
		NODE_ENV: 'production',
		HOST: config.appHost,
		PORT: String(config.appPort),
		ORIGIN: origin,
		DATABASE_URL: databaseUrlValue,
		BENCHCALL_UPLOADS_DIR: config.uploadsDir,
		BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT || '12M',
		SHUTDOWN_TIMEOUT: shutdownTimeout,
		...fakes.env
	}
});

await waitForHttp(`http://${config.appHost}:${config.appPort}/sign-in`, app);
const pad = (s, n) => s + ' '.repeat(Math.max(1, n - s.length));
console.log(`
  Benchcall is running at ${origin}   (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)

  Demo sign-ins (password for all: ${demoPassword})
${[...demoAccounts, ...otherAccounts].map((a) => `    ${pad(a.email, 30)} ${a.role}`).join('\n')}

  The last two belong to a second demo shop. Specs in the demo shop are invented demo values.
  Ctrl+C stops the app; \`npm run db:stop\` stops PostgreSQL.
`);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM']) {
	process.on(signal, () => {
		if (stopping) return;
		stopping = true;
		console.log('\nStopping Benchcall…');
		app.kill('SIGTERM');
		fakes.close();
		setTimeout(() => app.kill('SIGKILL'), 8000).unref();
	});
}
app.on('exit', (code, signal) => {
	if (!stopping) console.error(`Benchcall stopped unexpectedly (${signal ?? `exit ${code}`}).`);
	process.exit(stopping ? 0 : code || 1);
});

async function waitForHttp(url, child) {
	for (let i = 0; i < 200; i++) {
		if (child.exitCode !== null) {
			console.error(
				`The app exited during start-up (exit ${child.exitCode}). Is port ${config.appPort} taken? Set PORT in .env.`
			);
			process.exit(1);
		}
		try {
			const res = await fetch(url, { redirect: 'manual' });
			if (res.status < 500) return;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	console.error(`The app did not answer on ${url} within 20 s.`);
	process.exit(1);
}
