// Resources of both demo shops for the security checks, made straight in the test database:
// a job card of each shop with a step, an entry, a photo, an issued invoice and a mail in the
// outbox, plus a procedure, a part, a torque tool and a checklist item. Every dynamic segment of
// every route gets a real id of the shop that owns it, so "another shop's id" is a real row
// and not a made-up one. Jobs are open with no bay, so no other spec's Bench or Floor changes.
import { randomBytes, randomUUID } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import MailComposer from 'nodemailer/lib/mail-composer';
import { db } from '../helpers/bench-db';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** Where the web server keeps uploads (the same expression as in playwright.config.ts). */
export const uploadsDir = resolve(root, process.env.BENCHCALL_UPLOADS_DIR ?? '.data/test-uploads');

/** A 1 × 1 PNG (signature 89 50 4E 47 0D 0A 1A 0A, then IHDR, IDAT, IEND). */
export const tinyPng = Buffer.from(
	'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==',
	'base64'
);

export interface Target {
	shopId: string;
	/** The job card made for the checks, and its number. */
	jobId: string;
	number: string;
	entryId: string;
	photoId: string;
	invoiceId: string;
	token: string;
	procedureId: string;
	/** A step of `procedureId` (library). */
	stepId: string;
	partId: string;
	toolId: string;
	inspectionItemId: string;
	outboxId: string;
	vehicleId: string;
	/** The customer of `vehicleId`. */
	customerId: string;
	/** A staff account of the shop that is not the one signed in. */
	userId: string;
	/** Words only this shop's data holds: none may show in the other shop's answers. */
	markers: string[];
	/** Numbers only this shop's data holds (job numbers), matched as whole numbers. */
	numbers: string[];
}

const kettle = {
	name: 'Kettle Street%',
	base: 6000,
	marker: 'SECMARK-KETTLE',
	tech: 'tomasz@kettlestreet.test',
	other: 'ruth@kettlestreet.test',
	// Seeded names and registrations (scripts/seed.ts, scripts/lib/demo.js).
	words: [
		'Kettle Street',
		'kettlestreet.test',
		'Aoife Brennan-Kato',
		'Samir Oduya',
		'Lotte van Riemsdijk',
		'Courier Co-op Eastside',
		'KS 24 LMB',
		'KS 19 QRT',
		'Marta Lindqvist-Obi',
		'Tomasz Veerman',
		'Ruth Adeyemi-Holt',
		'Ines Calloway'
	]
};

const harbour = {
	name: 'Harbour Lane%',
	base: 9000,
	marker: 'SECMARK-HARBOUR',
	tech: 'tech@harbourlane.test',
	other: 'tech@harbourlane.test',
	words: [
		'Harbour Lane',
		'harbourlane.test',
		'Rosa Quintero-Nakamura',
		'HL 20 SCT',
		'Pia Svensgaard',
		'Kofi Brandauer'
	]
};

type ShopSeed = typeof kettle;

async function makeTarget(s: ShopSeed): Promise<Target> {
	const sql = db();
	const [shop] = await sql`select id from shop where name like ${s.name}`;
	const [tech] = await sql`select id from "user" where email = ${s.tech}`;
	const [other] = await sql`select id from "user" where email = ${s.other}`;
	const [vehicle] = await sql`
		select id, customer_id from vehicle where shop_id = ${shop.id} order by registration limit 1`;
	const m = s.marker;
	const t = await sql.begin(async (tx) => {
		const [proc] = await tx`
			insert into procedure (shop_id, name, applies_to, flat_rate_hours)
			values (${shop.id}, ${m + ' procedure'}, 'Security checks', 0.5) returning id`;
		const [step] = await tx`
			insert into procedure_step (shop_id, procedure_id, position, label, aliases, unit, nominal, min, max)
			values (${shop.id}, ${proc.id}, 1, 'Caliper bolt', ${['caliper']}, 'N.m', 30, 27, 33)
			returning *`;
		const [part] = await tx`
			insert into part (shop_id, code, description, unit, price_minor)
			values (${shop.id}, ${m + '-' + randomBytes(3).toString('hex')}, ${m + ' part'}, 'each', 100)
			returning id`;
		const [tool] = await tx`
			insert into torque_tool (shop_id, identifier, kind, range_min, range_max, unit, calibrated_on)
			values (${shop.id}, ${m + '-' + randomBytes(3).toString('hex')}, 'Type II class A click',
				5, 60, 'N.m', ${new Date().toISOString().slice(0, 10)})
			returning id`;
		const [item] = await tx`
			insert into inspection_item (shop_id, label, position, active)
			values (${shop.id}, ${m + ' checklist item'}, 99, false) returning id`;

		// Numbers taken under the same locks as intake and the Floor's test jobs.
		await tx`select pg_advisory_xact_lock(hashtextextended(${'job-number:' + shop.id}, 0))`;
		await tx`select pg_advisory_xact_lock(hashtext(${'floor-e2e-' + shop.id}))`;
		const [{ n }] = await tx`
			select greatest(coalesce(max(number), 0), ${s.base})::int + 1 as n
			from job where shop_id = ${shop.id}`;
		const [job] = await tx`
			insert into job (shop_id, number, customer_id, vehicle_id, technician_id, state, concern)
			values (${shop.id}, ${n}, ${vehicle.customer_id}, ${vehicle.id}, ${tech.id}, 'open',
				${m + ' job concern'})
			returning id, number`;
		const [jp] = await tx`
			insert into job_procedure (shop_id, job_id, procedure_id, name, position)
			values (${shop.id}, ${job.id}, ${proc.id}, ${m + ' procedure'}, 1) returning id`;
		const [jobStep] = await tx`
			insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id, position, label,
				aliases, unit, nominal, min, max)
			values (${shop.id}, ${job.id}, ${jp.id}, ${step.id}, 1, ${step.label}, ${step.aliases},
				${step.unit}, ${step.nominal}, ${step.min}, ${step.max})
			returning id`;
		const entryId = randomUUID();
		await tx`
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, occurred_at)
			values (${entryId}, ${shop.id}, ${job.id}, ${jobStep.id}, ${tech.id}, 'measure',
				${'caliper 30 Nm ' + m}, 'typed', 30, 'N.m', 30, 'N.m', 'in', now())`;

		const photoId = randomUUID();
		const key = `${shop.id}/${photoId}.png`;
		mkdirSync(dirname(join(uploadsDir, key)), { recursive: true });
		writeFileSync(join(uploadsDir, key), tinyPng);
		await tx`
			insert into attachment (id, shop_id, job_id, entry_id, file_name, mime, bytes, storage_key,
				uploaded_by)
			values (${photoId}, ${shop.id}, ${job.id}, ${entryId}, ${m + '.png'}, 'image/png',
				${tinyPng.length}, ${key}, ${tech.id})`;

		// An issued invoice takes the shop's next number from its counter, as issuing does.
		await tx`insert into invoice_counter (shop_id, next_number) values (${shop.id}, 1)
			on conflict do nothing`;
		const [{ taken }] = await tx`
			update invoice_counter set next_number = next_number + 1 where shop_id = ${shop.id}
			returning next_number - 1 as taken`;
		const token = randomBytes(32).toString('base64url');
		const [invoice] = await tx`
			insert into invoice (shop_id, job_id, number, status, currency, issued_at, customer_token)
			values (${shop.id}, ${job.id}, ${taken}, 'issued', 'EUR', now(), ${token}) returning id`;

		const raw = await new MailComposer({
			from: '"Benchcall" <invoices@benchcall.test>',
			to: 'customer@example.test',
			subject: `${m} invoice`,
			text: `${m} message body`,
			attachments: [{ filename: `${m}.txt`, content: `${m} attachment`, contentType: 'text/plain' }]
		})
			.compile()
			.build();
		const [mail] = await tx`
			insert into mail_outbox (shop_id, invoice_id, to_address, subject, status, raw)
			values (${shop.id}, ${invoice.id}, 'customer@example.test', ${m + ' invoice'}, 'sent',
				${raw.toString('utf8')})
			returning id`;

		return {
			shopId: shop.id as string,
			jobId: job.id as string,
			number: String(job.number),
			entryId,
			photoId,
			invoiceId: invoice.id as string,
			token,
			procedureId: proc.id as string,
			stepId: step.id as string,
			partId: part.id as string,
			toolId: tool.id as string,
			inspectionItemId: item.id as string,
			outboxId: mail.id as string,
			vehicleId: vehicle.id as string,
			customerId: vehicle.customer_id as string,
			userId: other.id as string
		};
	});
	return { ...t, markers: [m, ...s.words], numbers: [t.number] };
}

let made: Promise<{ kettle: Target; harbour: Target }> | null = null;

/** Both shops' targets, made once per worker. */
export function securityTargets() {
	made ??= (async () => ({
		kettle: await makeTarget(kettle),
		harbour: await makeTarget(harbour)
	}))();
	return made;
}

/** The markers of `t` found in `body` (whole numbers for job numbers). */
export function leaksOf(t: Target, body: string): string[] {
	const found = t.markers.filter((w) => body.includes(w));
	for (const n of t.numbers) {
		if (new RegExp(`(?<![\\w.-])${n}(?![\\w.-])`).test(body)) found.push(n);
	}
	return found;
}

/**
 * A job of the demo shop for fuzzing, in work with no technician and no bay (the foreman
 * writes on it), with the library's periodic service steps and one value over spec waiting in
 * the Floor's queue. One per fuzzed route, so that what one route changes never steers another.
 */
export async function makeFuzzJob() {
	const sql = db();
	const [shop] = await sql`select id from shop where name like ${kettle.name}`;
	const [foreman] = await sql`select id from "user" where email = 'foreman@kettlestreet.test'`;
	const [proc] = await sql`
		select id, name from procedure where shop_id = ${shop.id} and name like 'Periodic service%'`;
	return sql.begin(async (tx) => {
		await tx`select pg_advisory_xact_lock(hashtextextended(${'job-number:' + shop.id}, 0))`;
		await tx`select pg_advisory_xact_lock(hashtext(${'floor-e2e-' + shop.id}))`;
		const [{ n }] = await tx`
			select greatest(coalesce(max(number), 0), ${kettle.base})::int + 1 as n
			from job where shop_id = ${shop.id}`;
		const [job] = await tx`
			insert into job (shop_id, number, state, concern)
			values (${shop.id}, ${n}, 'in_work', ${kettle.marker + ' fuzz job'}) returning id, number`;
		const [jp] = await tx`
			insert into job_procedure (shop_id, job_id, procedure_id, name, position)
			values (${shop.id}, ${job.id}, ${proc.id}, ${proc.name}, 1) returning id`;
		const steps = await tx`
			insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id, position, label,
				aliases, unit, nominal, min, max, caution, part_id, part_quantity)
			select shop_id, ${job.id}, ${jp.id}, id, position, label, aliases, unit, nominal, min, max,
				caution, part_id, part_quantity
			from procedure_step where procedure_id = ${proc.id} order by position
			returning id, label, aliases, unit`;
		const axle = steps.find((s) => s.label === 'Rear axle nut')!;
		const over = randomUUID();
		await tx`
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, occurred_at)
			values (${over}, ${shop.id}, ${job.id}, ${axle.id}, ${foreman.id}, 'measure',
				'rear axle 120 Nm', 'typed', 120, 'N.m', 120, 'N.m', 'high', now())`;
		return {
			id: job.id as string,
			number: Number(job.number),
			steps: steps.map((s) => ({
				id: s.id as string,
				label: s.label as string,
				aliases: s.aliases as string[],
				unit: s.unit as string | null
			})),
			overEntryId: over
		};
	});
}

/** What a failed request must leave as it was: the job's rows and state. */
export async function jobRows(jobId: string) {
	const [row] = await db()`
		select j.state,
			(select count(*)::int from log_entry e where e.job_id = j.id) as entries,
			(select count(*)::int from job_state_change c where c.job_id = j.id) as changes,
			(select count(*)::int from attachment a where a.job_id = j.id) as photos
		from job j where j.id = ${jobId}`;
	return row as { state: string; entries: number; changes: number; photos: number };
}
