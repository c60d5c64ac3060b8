// The project's private PostgreSQL cluster in .data/pg, listening only on 127.0.0.1.
// Built-ins only: runs before node_modules exists.
import {
	chmodSync,
	chownSync,
	existsSync,
	mkdirSync,
	readFileSync,
	readdirSync,
	writeFileSync
} from 'node:fs';
import { join } from 'node:path';
import { capture, isRoot, must, run, step } from './run.js';
import { config } from './config.js';

/** Newest /usr/lib/postgresql/<v>/bin that has initdb, or null. */
export function findPgBin() {
	const base = '/usr/lib/postgresql';
	if (!existsSync(base)) return null;
	const versions = readdirSync(base)
		.filter((v) => existsSync(join(base, v, 'bin', 'initdb')))
		.sort((a, b) => Number(b) - Number(a));
	return versions.length ? join(base, versions[0], 'bin') : null;
}

/** Installs Debian's postgresql when its binaries are missing (root only). */
export async function ensurePostgresInstalled() {
	let bin = findPgBin();
	if (bin) return bin;
	if (!isRoot) {
		console.error(
			'\nPostgreSQL server binaries are not installed. Install them once as root, then run this again:\n\n' +
				'    sudo apt-get update && sudo apt-get install -y postgresql\n'
		);
		process.exit(1);
	}
	step("Installing PostgreSQL from Debian's packages (once)");
	await must('apt-get', ['update', '-qq']);
	await must('apt-get', ['install', '-y', '-qq', 'postgresql'], {
		env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
	});
	bin = findPgBin();
	if (!bin) {
		console.error('apt-get finished but no initdb was found under /usr/lib/postgresql/*/bin.');
		process.exit(1);
	}
	return bin;
}

/** Command prefix for the cluster's own binaries: as root they run as the postgres user. */
function asOwner(bin, tool, args) {
	const exe = join(bin, tool);
	return isRoot ? ['runuser', ['-u', 'postgres', '--', exe, ...args]] : [exe, args];
}

function handToPostgres(path) {
	if (!isRoot) return;
	const uid = Number(capture('id', ['-u', 'postgres']));
	const gid = Number(capture('id', ['-g', 'postgres']));
	if (!Number.isInteger(uid)) {
		console.error('The postgres system user is missing; reinstall the postgresql package.');
		process.exit(1);
	}
	chownSync(path, uid, gid);
}

/** As root the cluster runs as `postgres`, which must be able to walk into the checkout. */
function checkReachable() {
	if (!isRoot) return;
	const r = capture('runuser', ['-u', 'postgres', '--', 'test', '-x', config.dataDir]);
	const ok = r !== null;
	if (!ok) {
		console.error(
			`\nThe postgres system user cannot reach ${config.dataDir}.\n` +
				'A checkout under a folder other users cannot enter (such as /root) cannot hold the cluster.\n' +
				'Move the checkout (for example to /srv or /home), or set BENCHCALL_DATA_DIR to a folder the postgres user can enter.'
		);
		process.exit(1);
	}
}

export function isRunning(bin) {
	const [cmd, args] = asOwner(bin, 'pg_ctl', ['status', '-D', config.pgDir]);
	return capture(cmd, args) !== null;
}

/** True once this process has started the cluster (rather than found it running). */
export let startedHere = false;

/** Creates the cluster if needed and starts it. Idempotent and quick when already running. */
export async function startCluster() {
	const bin = await ensurePostgresInstalled();
	mkdirSync(config.dataDir, { recursive: true });
	if (isRoot) {
		chmodSync(config.dataDir, 0o755);
	}
	checkReachable();
	if (!existsSync(join(config.pgDir, 'PG_VERSION'))) {
		step(`Creating the private PostgreSQL cluster in ${config.pgDir}`);
		mkdirSync(config.pgDir, { recursive: true, mode: 0o700 });
		handToPostgres(config.pgDir);
		const [cmd, args] = asOwner(bin, 'initdb', [
			'-D',
			config.pgDir,
			'-U',
			'postgres',
			'--auth-local=trust',
			'--auth-host=scram-sha-256',
			'-E',
			'UTF8',
			'--locale=C.UTF-8'
		]);
		await must(cmd, args, { stdio: ['ignore', 'ignore', 'inherit'] });
	}
	mkdirSync(config.socketDir, { recursive: true });
	if (isRoot) handToPostgres(config.socketDir);
	if (isRunning(bin)) return bin;
	if (!existsSync(config.pgLog)) writeFileSync(config.pgLog, '');
	if (isRoot) handToPostgres(config.pgLog);
	const [cmd, args] = asOwner(bin, 'pg_ctl', [
		'start',
		'-w',
		'-t',
		'60',
		'-D',
		config.pgDir,
		'-l',
		config.pgLog,
		'-o',
		`-c listen_addresses=127.0.0.1 -p ${config.pgPort} -k ${config.socketDir}`
	]);
	const code = await run(cmd, args, { stdio: ['ignore', 'ignore', 'inherit'] });
	if (code !== 0) {
		const log = existsSync(config.pgLog)
			? readFileSync(config.pgLog, 'utf8').split('\n').slice(-12).join('\n')
			: '';
		console.error(
			`\nPostgreSQL did not start on 127.0.0.1:${config.pgPort}. Last lines of ${config.pgLog}:\n${log}`
		);
		if (/already in use|could not bind/i.test(log)) {
			console.error(
				`\nPort ${config.pgPort} is taken. Set BENCHCALL_DB_PORT in .env to a free port.`
			);
		}
		process.exit(1);
	}
	console.log(`  PostgreSQL listening on 127.0.0.1:${config.pgPort}`);
	startedHere = true;
	return bin;
}

export async function stopCluster() {
	const bin = findPgBin();
	if (!bin || !existsSync(join(config.pgDir, 'PG_VERSION')) || !isRunning(bin)) {
		console.log('The Benchcall PostgreSQL cluster is not running.');
		return;
	}
	const [cmd, args] = asOwner(bin, 'pg_ctl', ['stop', '-m', 'fast', '-D', config.pgDir]);
	await must(cmd, args);
}

/** Runs SQL as the cluster's superuser over the Unix socket. Returns stdout or null. */
export function psqlAdmin(bin, sql, db = 'postgres') {
	return capture(join(bin, 'psql'), [
		'-X',
		'-q',
		'-t',
		'-A',
		'-v',
		'ON_ERROR_STOP=1',
		'-h',
		config.socketDir,
		'-p',
		String(config.pgPort),
		'-U',
		'postgres',
		'-d',
		db,
		'-c',
		sql
	]);
}

function lit(s) {
	return `'${String(s).replaceAll("'", "''")}'`;
}
function ident(s) {
	return `"${String(s).replaceAll('"', '""')}"`;
}

/** Creates the app's role (idempotent) and the database; `fresh` drops it first. */
export function ensureDatabase(bin, dbName, { fresh = false } = {}) {
	const role = config.dbUser;
	const roleSql =
		`DO $$ BEGIN IF NOT EXISTS (SELECT FROM pg_roles WHERE rolname = ${lit(role)}) THEN ` +
		`CREATE ROLE ${ident(role)} LOGIN CREATEDB PASSWORD ${lit(config.dbPassword)}; ` +
		`ELSE ALTER ROLE ${ident(role)} LOGIN CREATEDB PASSWORD ${lit(config.dbPassword)}; END IF; END $$;`;
	if (psqlAdmin(bin, roleSql) === null) {
		console.error(`Could not create the database role ${role}.`);
		process.exit(1);
	}
	if (fresh) psqlAdmin(bin, `DROP DATABASE IF EXISTS ${ident(dbName)} WITH (FORCE)`);
	const exists = psqlAdmin(bin, `SELECT 1 FROM pg_database WHERE datname = ${lit(dbName)}`);
	if (exists !== '1') {
		if (
			psqlAdmin(bin, `CREATE DATABASE ${ident(dbName)} OWNER ${ident(role)} ENCODING 'UTF8'`) ===
			null
		) {
			console.error(`Could not create the database ${dbName}.`);
			process.exit(1);
		}
	}
}
