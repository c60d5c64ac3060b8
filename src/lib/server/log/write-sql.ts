// The statements that insert entries, each reading the stored row back in the same round trip.
import { BACKDATE_BEFORE_OPENING_MS } from '$lib/schemas/dates';
import { client } from '../db';
import type { NewEntry } from './entry';

// The stored row read back, in the same statement as the insert (CTE `e`), in the shape every
// reader gets (entrySelect). A new entry has no retraction and no photo yet (both would point
// at it by a foreign key), so those are constants here.
const readBack = client`
	select e.id, e.seq, e.job_id, e.job_step_id, st.label as step_label, e.author_id,
		a.name as author_name, e.kind, e.raw_text, e.source, e.value, e.unit, e.spec_value,
		e.spec_unit, st.min as spec_min, st.max as spec_max, st.nominal as spec_nominal, e.verdict,
		e.fluid, e.fluid_verdict, e.note, e.torque_tool_id, tt.identifier as torque_tool, e.tool_calibration_overdue,
		e.adapter_mm, e.tool_length_mm, e.wrench_setting, e.wrench_setting_unit,
		e.retracts, e.occurred_at, e.recorded_at, null as retracted_by_id,
		null as retracted_by_name, null as retracted_at, '[]'::json as photos`;
const readBackFrom = client`
	from e
	join "user" a on a.id = e.author_id
	left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
	left join torque_tool tt on tt.id = e.torque_tool_id and tt.shop_id = e.shop_id`;

/** One entry; no row when the id is stored already. Prepared (postgres.js keeps it per connection). */
export function insertOne(entry: NewEntry): Promise<Record<string, unknown>[]> {
	return client`
		with e as (
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, fluid, fluid_verdict, note, torque_tool_id,
				tool_calibration_overdue, adapter_mm, tool_length_mm, wrench_setting, wrench_setting_unit,
				occurred_at)
			values (${entry.id}, ${entry.shopId}, ${entry.jobId}, ${entry.jobStepId}, ${entry.authorId},
				${entry.kind}, ${entry.rawText}, ${entry.source}, ${entry.value}, ${entry.unit},
				${entry.specValue}, ${entry.specUnit}, ${entry.verdict}, ${entry.fluid},
				${entry.fluidVerdict}, ${entry.note},
				${entry.torqueToolId}, ${entry.overdue}, ${entry.adapterMm}, ${entry.toolLengthMm},
				${entry.wrenchSetting}, ${entry.wrenchSettingUnit}, ${entry.occurredAt})
			on conflict (shop_id, id) do nothing
			returning *
		)
		${readBack} ${readBackFrom}`;
}

export interface BatchRow extends NewEntry {
	/** Written only while the job still has this steps version ... */
	stepsVersion: number;
	/** ... and its shop this tolerance ... */
	pct: number;
	/** ... and the author may write on any job of the shop, or the job is assigned to them. */
	anyJob: boolean;
}

/** A group commit's batch in one statement: the rows whose conditions held, by id, with the job's state. */
export async function insertBatch(
	batch: BatchRow[]
): Promise<Map<string, Record<string, unknown>>> {
	const rows = await client`
		with r as (
			select * from json_to_recordset(${JSON.stringify(batch)}::json) as r(
				"id" uuid, "shopId" uuid, "jobId" uuid, "jobStepId" uuid, "authorId" uuid,
				"kind" entry_kind, "rawText" text, "source" entry_source, "value" float8, "unit" text,
				"specValue" float8, "specUnit" text, "verdict" verdict, "fluid" text,
				"fluidVerdict" text, "note" text,
				"torqueToolId" uuid, "overdue" boolean, "occurredAt" timestamptz,
				"stepsVersion" integer, "pct" float8, "anyJob" boolean)
		), ok as (
			select r.*, j.state as job_state
			from r
			join job j on j.id = r."jobId" and j.shop_id = r."shopId"
				and j.state in ('open', 'in_work', 'final_inspection', 'on_hold')
				and j.steps_version = r."stepsVersion" and (r."anyJob" or j.technician_id = r."authorId")
				and r."occurredAt" >= j.created_at - ${BACKDATE_BEFORE_OPENING_MS} * interval '1 millisecond'
			join shop sh on sh.id = j.shop_id and sh.default_tolerance_pct = r.pct
		), e as (
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				value, unit, spec_value, spec_unit, verdict, fluid, fluid_verdict, note, torque_tool_id,
				tool_calibration_overdue, occurred_at)
			select "id", "shopId", "jobId", "jobStepId", "authorId", "kind", "rawText", "source",
				"value", "unit", "specValue", "specUnit", "verdict", "fluid", "fluidVerdict", "note",
				"torqueToolId", "overdue", "occurredAt"
			from ok
			-- Each entry locks its job's chain head (drizzle/0010): one order for all batches.
			order by "jobId"
			on conflict (shop_id, id) do nothing
			returning *
		)
		${readBack}, ok.job_state ${readBackFrom} join ok on ok.id = e.id`;
	return new Map(rows.map((row) => [row.id as string, row]));
}
