// Shared by the fault tests (scripts/faults.ts) and the load benchmark (scripts/bench-load.ts):
// the built app as a child process, a crew of signed-in staff with jobs of their own in the demo
// shop, and small measuring helpers. Everything here is real: `node build`, the local
// PostgreSQL, sign-in through the form.
import { spawn, type ChildProcess } from 'node:child_process';
import { createWriteStream, readFileSync } from 'node:fs';
import postgres from 'postgres';
import { hashPassword } from '../../src/lib/server/password';
import { shutdownTimeout } from './config.js';
import { demoPassword } from './demo.js';

export interface AppProcess {
	base: string;
	port: number;
	proc: ChildProcess;
	pid: number;
	/** Resolves with the exit code (or the signal's name) once the process has ended. */
	exited: Promise<number | string>;
	logFile: string;
}

/** Starts `node build` on 127.0.0.1:`port` against `databaseUrl` and waits until it answers. */
export async function startApp(opts: {
	port: number;
	databaseUrl: string;
	logFile: string;
	env?: Record<string, string>;
	/** The built app's folder (default `build`). */
	dir?: string;
}): Promise<AppProcess> {
	const base = `http://127.0.0.1:${opts.port}`;
	const log = createWriteStream(opts.logFile, { flags: 'a' });
	const proc = spawn(process.execPath, [opts.dir ?? 'build'], {
		env: {
			...process.env,
			DATABASE_URL: opts.databaseUrl,
			PORT: String(opts.port),
			HOST: '127.0.0.1',
			ORIGIN: base,
			SHUTDOWN_TIMEOUT: shutdownTimeout,
			...opts.env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	proc.stdout?.pipe(log, { end: false });
	proc.stderr?.pipe(log, { end: false });
	const exited = new Promise<number | string>((resolve) =>
		proc.on('exit', (code, signal) => resolve(code ?? signal ?? 'unknown'))
	);
	const app: AppProcess = {
		base,
		port: opts.port,
		proc,
		pid: proc.pid ?? -1,
		exited,
		logFile: opts.logFile
	};
	const up = await waitUp(base, 60_000, exited);
	if (!up) throw new Error(`the app on ${base} did not answer within 60 s (log: ${opts.logFile})`);
	return app;
}

/** Polls the sign-in page until it answers 200; false on timeout or when the process ended. */
export async function waitUp(base: string, timeoutMs: number, exited?: Promise<unknown>) {
	let gone = false;
	void exited?.then(() => (gone = true));
	const until = Date.now() + timeoutMs;
	while (Date.now() < until && !gone) {
		try {
			const res = await fetch(`${base}/sign-in`, { signal: AbortSignal.timeout(2000) });
			await res.arrayBuffer();
			if (res.ok) return true;
		} catch {
			// not listening yet
		}
		await sleep(100);
	}
	return false;
}

/** Sends `signal` and waits for the process to end (SIGKILL after `graceMs`). */
export async function stopApp(
	app: AppProcess,
	signal: NodeJS.Signals = 'SIGTERM',
	graceMs = 10_000
) {
	if (app.proc.exitCode !== null || app.proc.signalCode !== null) return app.exited;
	app.proc.kill(signal);
	const timer = setTimeout(() => app.proc.kill('SIGKILL'), graceMs);
	const how = await app.exited;
	clearTimeout(timer);
	return how;
}

export interface CrewMember {
	id: string;
	email: string;
	name: string;
	jobId: string;
	jobNumber: number;
}

export interface Crew {
	shopId: string;
	technicians: CrewMember[];
	foremen: Omit<CrewMember, 'jobId' | 'jobNumber'>[];
}

/**
 * Adds `technicians` technicians (each with a job of its own in work: the demo periodic service's
 * steps copied on) and `foremen` foremen to the demo shop, all with the demo password.
 */
export async function makeCrew(
	databaseUrl: string,
	opts: { technicians: number; foremen: number; prefix: string; firstJob: number }
): Promise<Crew> {
	const sql = postgres(databaseUrl, { max: 1, onnotice: () => {} });
	try {
		const hash = await hashPassword(demoPassword);
		return await sql.begin(async (tx) => {
			const [shop] = await tx`select id, bays from shop where name like 'Kettle Street%'`;
			const [proc] = await tx`select id, name from procedure
				where shop_id = ${shop.id} and name like 'Periodic service%'`;
			const bays = (shop.bays as string[]).length ? (shop.bays as string[]) : ['Bay 1'];
			const pad = (n: number) => String(n).padStart(2, '0');
			const technicians: CrewMember[] = [];
			for (let i = 1; i <= opts.technicians; i++) {
				const email = `${opts.prefix}-tech-${pad(i)}@kettlestreet.test`;
				const name = `Crew technician ${pad(i)}`;
				const [u] = await tx`insert into "user" (shop_id, email, name, role, password_hash)
					values (${shop.id}, ${email}, ${name}, 'technician', ${hash}) returning id`;
				const number = opts.firstJob + i - 1;
				const [job] = await tx`insert into job (shop_id, number, technician_id, bay, state, concern)
					values (${shop.id}, ${number}, ${u.id}, ${bays[(i - 1) % bays.length]}, 'in_work',
						'Periodic service (crew job)') returning id`;
				const [jp] =
					await tx`insert into job_procedure (shop_id, job_id, procedure_id, name, position)
					values (${shop.id}, ${job.id}, ${proc.id}, ${proc.name}, 1) returning id`;
				await tx`insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id,
						position, label, aliases, unit, nominal, min, max)
					select ${shop.id}, ${job.id}, ${jp.id}, ps.id, ps.position, ps.label, ps.aliases,
						ps.unit, ps.nominal, ps.min, ps.max
					from procedure_step ps where ps.procedure_id = ${proc.id}`;
				technicians.push({ id: u.id, email, name, jobId: job.id, jobNumber: number });
			}
			const foremen: Crew['foremen'] = [];
			for (let i = 1; i <= opts.foremen; i++) {
				const email = `${opts.prefix}-foreman-${pad(i)}@kettlestreet.test`;
				const name = `Crew foreman ${pad(i)}`;
				const [u] = await tx`insert into "user" (shop_id, email, name, role, password_hash)
					values (${shop.id}, ${email}, ${name}, 'foreman', ${hash}) returning id`;
				foremen.push({ id: u.id, email, name });
			}
			return { shopId: shop.id as string, technicians, foremen };
		});
	} finally {
		await sql.end({ timeout: 2 });
	}
}

/** Signs in through the form, as a browser would; returns the `name=value` session cookie. */
export async function signIn(base: string, email: string, password = demoPassword) {
	const res = await fetch(`${base}/sign-in`, {
		method: 'POST',
		redirect: 'manual',
		headers: { origin: base, 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ email, password })
	});
	await res.arrayBuffer();
	const cookie = res.headers.getSetCookie().find((c) => c.startsWith('benchcall_session='));
	if (!cookie) throw new Error(`sign-in of ${email} failed (${res.status})`);
	return cookie.split(';')[0];
}

/** Resident memory of a process in MB (Linux /proc), or null when it has ended. */
export function rssMb(pid: number): number | null {
	try {
		const status = readFileSync(`/proc/${pid}/status`, 'utf8');
		const kb = Number(/VmRSS:\s+(\d+)/.exec(status)?.[1]);
		return Number.isFinite(kb) ? kb / 1024 : null;
	} catch {
		return null;
	}
}

/** The p-quantile (0–1) of ascending `sorted` values (nearest rank); NaN when empty. */
export function quantile(sorted: readonly number[], p: number): number {
	if (sorted.length === 0) return Number.NaN;
	const rank = Math.ceil(p * sorted.length);
	return sorted[Math.min(sorted.length - 1, Math.max(0, rank - 1))];
}

/** Load average and core count, printed beside every figure: the machine is shared. */
export function machineLoad(): string {
	try {
		const [one, five] = readFileSync('/proc/loadavg', 'utf8').split(' ');
		return `load average ${one} (1 min), ${five} (5 min)`;
	} catch {
		return 'load average unknown';
	}
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
