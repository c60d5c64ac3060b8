/**
 * Evidence pack benchmark: a job with 2,000 log entries and 200 photos in a scratch database;
 * prints the measured time to read the pack and to stream its PDF, the CPU time it took, the
 * machine's load, the peak memory of the process while doing so, and the PDF's size and pages
 * (pdfinfo). Figures only; the goal: the whole pack within 10 s, memory bounded (photos are
 * shrunk a few at a time, SHRINK_POOL, and the PDF is streamed to a file as the route streams it
 * to the browser). The runs are measured in a fresh process, so the memory figures are the
 * pack's own and not the seeding's.
 *
 * The photos: 190 phone-sized JPEGs (4032×3024, ~3 MB: smooth colour with sensor grain, eight
 * different ones), 4 PNG screenshots (2560×1600), and six that cannot be drawn: 2 HEIC files
 * (sharp's build reads no HEVC), 2 JPEGs cut short, 2 files missing from storage; each of those
 * must show a placeholder line. Run 1 finds no downscaled copies (photos stored before copies
 * were recorded, before the app's background backfill has run): it shrinks and keeps copies until
 * its time budget (PACK_COPY_BUDGET_MS) is spent, then puts "copy being made" lines. Run 2 comes
 * right after and makes the copies run 1 left. Then the backfill runs as `photos:thumbs` does,
 * and run 3 reads only copies, as a pack does for photos uploaded through the app (photos.ts).
 *
 *   npm run bench:evidence
 */
import { spawnSync } from 'node:child_process';
import { createWriteStream, mkdtempSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { availableParallelism, loadavg } from 'node:os';
import { join } from 'node:path';
import { pipeline } from 'node:stream/promises';
import { performance } from 'node:perf_hooks';
import postgres from 'postgres';
import { loadEvidence } from '../src/lib/server/evidence';
import { evidencePdfStream } from '../src/lib/server/evidence-pdf';
import { localDiskStorage } from '../src/lib/server/storage-disk';
import { PACK_COPY_BUDGET_MS, PACK_MS_PER_PHOTO_LEFT, SHRINK_POOL } from '../src/lib/server/thumbs';
import { backfillCopies } from '../src/lib/server/thumbs-backfill';
import { databaseUrl, config } from './lib/config.js';
import { applyMigrations } from './lib/migrate.js';
import { ensureDatabase, startCluster } from './lib/pg.js';
import { testPhotos } from '../src/lib/server/db/photo-fixtures';

const dbName = 'benchcall_bench_evidence';
const ENTRIES = 2000;
const PHOTOS = 200;
const RUNS = 3;
const availableCores = availableParallelism();

/** The scratch job, seeded by the first process and measured by the second. */
interface Scratch {
	url: string;
	dir: string;
	shopId: string;
	jobId: string;
}

async function seed(client: postgres.Sql, dir: string): Promise<Omit<Scratch, 'url' | 'dir'>> {
	const [shop] =
		await client`insert into shop (name) values ('Evidence bench (scratch)') returning id`;
	const [tech] = await client`insert into "user" (shop_id, email, name, role, password_hash)
		values (${shop.id}, ${'t-' + shop.id + '@bench.test'}, 'Technician', 'technician', 'x') returning id`;
	const [cust] =
		await client`insert into customer (shop_id, name) values (${shop.id}, 'Customer') returning id`;
	const [veh] = await client`insert into vehicle (shop_id, customer_id, registration, make, model)
		values (${shop.id}, ${cust.id}, 'BN 26 DEM', 'Demo make', 'Demo 125') returning id`;
	const [job] =
		await client`insert into job (shop_id, number, customer_id, vehicle_id, technician_id, state)
		values (${shop.id}, 1, ${cust.id}, ${veh.id}, ${tech.id}, 'in_work') returning id`;
	const [jp] = await client`insert into job_procedure (shop_id, job_id, name, position)
		values (${shop.id}, ${job.id}, 'Bench procedure', 1) returning id`;
	await client`insert into job_step (shop_id, job_id, job_procedure_id, position, label, unit, nominal, min, max)
		select ${shop.id}, ${job.id}, ${jp.id}, g, 'Bench step ' || g, 'N.m', 20 + g * 4, 18 + g * 4, 22 + g * 4
		from generate_series(1, 20) g`;
	const t0 = performance.now();
	await client`
		insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
			value, unit, spec_value, spec_unit, verdict, occurred_at)
		select gen_random_uuid(), ${shop.id}, ${job.id}, st.id, ${tech.id}, 'measure',
			'bench step ' || st.position || ' ' || (st.nominal + (g % 5) - 2) || ' nm', 'typed',
			st.nominal + (g % 5) - 2, 'N.m', st.nominal + (g % 5) - 2, 'N.m',
			(case when g % 5 = 0 then 'low' when g % 5 = 4 then 'high' else 'in' end)::verdict,
			now() - make_interval(secs => ${ENTRIES} - g)
		from generate_series(1, ${ENTRIES}) g
		join job_step st on st.job_id = ${job.id} and st.position = g % 20 + 1
		order by g`;
	const insertMs = performance.now() - t0;
	const t1 = performance.now();
	const photos = await testPhotos(PHOTOS);
	const photosMs = performance.now() - t1;
	mkdirSync(join(dir, shop.id), { recursive: true });
	const entries =
		await client`select id from log_entry where job_id = ${job.id} order by chain_pos`;
	let totalBytes = 0;
	for (const [i, p] of photos.entries()) {
		const id = crypto.randomUUID();
		const key = `${shop.id}/${id}.${p.ext}`;
		if (p.bytes) writeFileSync(join(dir, key), p.bytes);
		totalBytes += p.bytes?.length ?? 0;
		await client`insert into attachment (id, shop_id, job_id, entry_id, file_name, mime, bytes, storage_key)
			values (${id}, ${shop.id}, ${job.id}, ${entries[i * 10].id}, ${`photo-${i}-${p.kind}.${p.ext}`},
				${p.mime}, ${p.bytes?.length ?? 0}, ${key})`;
	}
	const kinds = new Map<string, number>();
	for (const p of photos) kinds.set(p.kind, (kinds.get(p.kind) ?? 0) + 1);
	console.log(
		`Seeded ${ENTRIES} entries (${insertMs.toFixed(0)} ms with the chain trigger, ` +
			`${((insertMs * 1000) / ENTRIES).toFixed(0)} µs an entry) and ${PHOTOS} photos, ` +
			`${(totalBytes / 1e6).toFixed(0)} MB in all (${[...kinds].map(([k, n]) => `${n} ${k}`).join(', ')}; ` +
			`made in ${(photosMs / 1000).toFixed(1)} s).`
	);

	return { shopId: shop.id, jobId: job.id };
}

async function measure({ url, dir, shopId, jobId }: Scratch) {
	const client = postgres(url, { max: 4, onnotice: () => {} });
	const storage = localDiskStorage(dir); // the app's own store, on a scratch folder
	console.log(
		`Shrink pool: ${SHRINK_POOL} photos at a time on ${availableCores} cores; a pack starts no ` +
			`copy after ${PACK_COPY_BUDGET_MS / 1000} s less what the photos after it keep (${PACK_MS_PER_PHOTO_LEFT} ms, plus their hashing).`
	);
	try {
		for (let run = 1; run <= RUNS; run++) {
			if (run === RUNS) {
				const t = performance.now();
				const n = await backfillCopies(client, storage, { pool: SHRINK_POOL, shopId });
				console.log(
					`backfill (as photos:thumbs): ${n.photos} photos looked at, ${n.made} copies made in ` +
						`${((performance.now() - t) / 1000).toFixed(1)} s, load ${loadavg()[0].toFixed(1)}`
				);
			}
			const rss0 = process.memoryUsage().rss;
			let peak = rss0;
			const sampler = setInterval(() => {
				peak = Math.max(peak, process.memoryUsage().rss);
			}, 20);
			const load = loadavg()[0];
			const cpu0 = process.cpuUsage();
			const a = performance.now();
			const pack = await loadEvidence(client, shopId, jobId);
			const b = performance.now();
			const file = join(dir, `pack-${run}.pdf`);
			let later = 0;
			const pdf = evidencePdfStream(pack!, storage, {
				sql: client,
				leftForLater: (n) => (later = n)
			});
			await pipeline(pdf, createWriteStream(file));
			const c = performance.now();
			const cpu = process.cpuUsage(cpu0);
			clearInterval(sampler);
			peak = Math.max(peak, process.memoryUsage().rss);
			const info = spawnSync('pdfinfo', [file], { encoding: 'utf8' });
			const pages = /Pages:\s+(\d+)/.exec(info.stdout)?.[1] ?? `? (pdfinfo: ${info.status})`;
			const text = spawnSync('pdftotext', [file, '-'], { encoding: 'utf8', maxBuffer: 1e8 }).stdout;
			const missing = text.split('photo file missing from storage').length - 1;
			const unreadable = text.split('cannot be drawn here').length - 1;
			const size = (await readFile(file)).length;
			const [rec] =
				await client`select count(thumb_key)::int as copies, count(sha256)::int as hashes
				from attachment where shop_id = ${shopId} and job_id = ${jobId}`;
			const copies = [
				'no downscaled copies, before the backfill',
				'the copies run 1 made, kept',
				'every copy, as the app makes them'
			][run - 1];
			console.log(
				`run ${run} (${copies}): read ${(b - a).toFixed(0)} ms, PDF ${(c - b).toFixed(0)} ms, total ` +
					`${((c - a) / 1000).toFixed(2)} s (goal ≤ 10 s); CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s ` +
					`on ${availableCores} cores, load ${load.toFixed(1)}; PDF ${(size / 1e6).toFixed(1)} MB, ${pages} pages, ` +
					`placeholders: ${missing} missing + ${unreadable} unreadable + ${later} copy being made; ` +
					`RSS ${(rss0 / 1e6).toFixed(0)} → peak ${(peak / 1e6).toFixed(0)} MB; ` +
					`recorded after it: ${rec.copies} copies, ${rec.hashes} hashes`
			);
		}
	} finally {
		await client.end({ timeout: 2 });
	}
}

const child = process.env.BENCH_EVIDENCE_SCRATCH;
if (child) {
	await measure(JSON.parse(child) as Scratch);
} else {
	const bin = await startCluster();
	ensureDatabase(bin, dbName, { fresh: true });
	const url = databaseUrl(dbName);
	await applyMigrations(url);
	const client = postgres(url, { max: 4, onnotice: () => {} });
	const dir = mkdtempSync(join(config.dataDir, 'bench-evidence-'));
	try {
		const ids = await seed(client, dir);
		const scratch: Scratch = { url, dir, ...ids };
		const run = spawnSync(process.execPath, [...process.execArgv, process.argv[1]], {
			stdio: 'inherit',
			env: { ...process.env, BENCH_EVIDENCE_SCRATCH: JSON.stringify(scratch) }
		});
		if (run.status !== 0) process.exitCode = run.status ?? 1;
	} finally {
		await client.end({ timeout: 2 });
		rmSync(dir, { recursive: true, force: true });
	}
}
