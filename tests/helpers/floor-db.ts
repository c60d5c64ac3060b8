// Test jobs of their own for the Floor's end-to-end checks, made straight in the test database so
// that they never share a queue item or a checklist with another spec file.
import { db } from './bench-db';

/** A job in the demo shop with the library's "Rear axle nut" step copied on, in work in Bay 1. */
export async function makeFloorJob(technicianEmail = 'tomasz@kettlestreet.test') {
	const sql = db();
	const [shop] = await sql`select id from shop where name like 'Kettle Street%'`;
	const [tech] = await sql`select id from "user" where email = ${technicianEmail}`;
	const [step] = await sql`
		select ps.*, p.name as procedure_name from procedure_step ps
		join procedure p on p.id = ps.procedure_id
		where ps.shop_id = ${shop.id} and ps.label = 'Rear axle nut' limit 1`;
	return sql.begin(async (tx) => {
		// Numbers far above the demo's, taken under the same lock as intake would.
		await tx`select pg_advisory_xact_lock(hashtext(${'floor-e2e-' + shop.id}))`;
		const [{ n }] = await tx`
			select greatest(coalesce(max(number), 0), 8000) + 1 as n from job where shop_id = ${shop.id}`;
		const [job] = await tx`
			insert into job (shop_id, number, technician_id, bay, state, concern)
			values (${shop.id}, ${n}, ${tech.id}, 'Bay 1', 'in_work', 'Floor test job')
			returning id, number`;
		const [jp] = await tx`
			insert into job_procedure (shop_id, job_id, procedure_id, name, position)
			values (${shop.id}, ${job.id}, ${step.procedure_id}, ${step.procedure_name}, 1)
			returning id`;
		await tx`
			insert into job_step (shop_id, job_id, job_procedure_id, procedure_step_id, position, label,
				aliases, unit, nominal, min, max)
			values (${shop.id}, ${job.id}, ${jp.id}, ${step.id}, 1, ${step.label}, ${step.aliases},
				${step.unit}, ${step.nominal}, ${step.min}, ${step.max})`;
		return { id: job.id as string, number: Number(job.number) };
	});
}

export async function setJobState(jobId: string, state: string) {
	await db()`update job set state = ${state} where id = ${jobId}`;
}

export async function jobRow(jobId: string) {
	const [row] = await db()`select state, signed_off_by, signed_off_at from job where id = ${jobId}`;
	return row;
}
