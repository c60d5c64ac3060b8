/**
 * Evidence pack benchmark: a job with 2,000 log entries and 200 photos (phone-sized JPEGs) in a
 * scratch database; prints the measured time to read the pack and to draw its PDF, the peak
 * memory of the process while doing so, and the PDF's size. Figures only; the goal:
 * the whole pack within 10 s, memory bounded (photos are shrunk a few at a time). Run 1 finds no
 * downscaled copies (photos stored before copies were made: each is shrunk now and kept); later
 * runs read the copies, as a pack does for photos uploaded through the app (photos.ts).
 *
 *   npm run bench:evidence
 */
import { mkdtempSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import postgres from 'postgres';
import sharp from 'sharp';
import { loadEvidence } from '../src/lib/server/evidence';
import { evidencePdf } from '../src/lib/server/evidence-pdf';
import type { FileStorage } from '../src/lib/server/storage';
import { databaseUrl, config } from './lib/config.js';
import { applyMigrations } from './lib/migrate.js';
import { ensureDatabase, startCluster } from './lib/pg.js';

const dbName = 'benchcall_bench_evidence';
const ENTRIES = 2000;
const PHOTOS = 200;
const RUNS = 3;

const bin = await startCluster();
ensureDatabase(bin, dbName, { fresh: true });
const url = databaseUrl(dbName);
await applyMigrations(url);
const client = postgres(url, { max: 4, onnotice: () => {} });
const dir = mkdtempSync(join(config.dataDir, 'bench-evidence-'));

const storage: FileStorage = {
	put: async (key, bytes) => writeFileSync(join(dir, key), bytes),
	get: async (key) => new Uint8Array(await readFile(join(dir, key))),
	remove: async () => {}
};

try {
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
	// One phone-sized photo (4032×3024, noisy so it compresses like a real one), stored 200 times.
	const photo = await sharp({
		create: {
			width: 4032,
			height: 3024,
			channels: 3,
			background: '#6a7b8c',
			noise: { type: 'gaussian', mean: 120, sigma: 20 }
		}
	})
		.jpeg({ quality: 85 })
		.toBuffer();
	mkdirSync(join(dir, shop.id), { recursive: true });
	const entries =
		await client`select id from log_entry where job_id = ${job.id} order by chain_pos`;
	for (let i = 0; i < PHOTOS; i++) {
		const id = crypto.randomUUID();
		const key = `${shop.id}/${id}.jpg`;
		writeFileSync(join(dir, key), photo);
		await client`insert into attachment (id, shop_id, job_id, entry_id, file_name, mime, bytes, storage_key)
			values (${id}, ${shop.id}, ${job.id}, ${entries[i * 10].id}, ${'photo-' + i + '.jpg'}, 'image/jpeg', ${photo.length}, ${key})`;
	}
	console.log(
		`Seeded ${ENTRIES} entries (${insertMs.toFixed(0)} ms with the chain trigger, ` +
			`${((insertMs * 1000) / ENTRIES).toFixed(0)} µs an entry) and ${PHOTOS} photos of ` +
			`${(photo.length / 1e6).toFixed(2)} MB each.`
	);

	for (let run = 1; run <= RUNS; run++) {
		global.gc?.();
		const rss0 = process.memoryUsage().rss;
		let peak = rss0;
		const sampler = setInterval(() => {
			peak = Math.max(peak, process.memoryUsage().rss);
		}, 20);
		const a = performance.now();
		const pack = await loadEvidence(client, shop.id, job.id);
		const b = performance.now();
		const pdf = await evidencePdf(pack!, storage);
		const c = performance.now();
		clearInterval(sampler);
		peak = Math.max(peak, process.memoryUsage().rss);
		const pages = (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
		const copies =
			run === 1 ? 'no downscaled copies yet' : 'copies made at upload, as the app does';
		console.log(
			`run ${run} (${copies}): read ${(b - a).toFixed(0)} ms, PDF ${(c - b).toFixed(0)} ms, total ` +
				`${((c - a) / 1000).toFixed(2)} s (goal ≤ 10 s); PDF ${(pdf.length / 1e6).toFixed(1)} MB, ` +
				`${pages} pages; RSS ${(rss0 / 1e6).toFixed(0)} → peak ${(peak / 1e6).toFixed(0)} MB`
		);
	}
} finally {
	await client.end({ timeout: 2 });
	rmSync(dir, { recursive: true, force: true });
}
