// The evidence pack of a job: everything a warranty or comeback dispute asks about, read in the
// job's chain order, with the hash chain's text forms so anyone can check it (chain.ts). It
// takes the postgres.js client (relative imports only), so bench:evidence runs it outside Kit.
import type { Sql } from 'postgres';
import { chainFields, eachChainRow } from './chain-verify';
import { canonicalJson } from '../evidence/chain';
import { toDate } from '../vehicles/vin';
import type { EvidenceEntry, EvidencePack } from '../evidence/pack';

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
const str = (v: unknown) => (v === null || v === undefined ? null : String(v));
const iso = (v: unknown) => (v === null || v === undefined ? null : toDate(v).toISOString());

/** The job card, vehicle and customer of a job of this shop; null when there is none. */
async function header(client: Sql, shopId: string, jobId: string) {
	const [row] = await client`
		select j.id, j.number, j.state, j.odometer, j.odometer_unit, j.concern, j.bay,
			j.created_at, j.signed_off_at, so.name as signed_off_by, t.name as technician,
			v.id as vehicle_id, v.registration, v.frame_number, v.make, v.model, v.year, v.colour,
			c.id as customer_id, c.name as customer_name, s.name as shop_name,
			h.pos as head_pos, h.hash as head_hash
		from job j
		join shop s on s.id = j.shop_id
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		left join customer c on c.id = j.customer_id and c.shop_id = j.shop_id
		left join "user" so on so.id = j.signed_off_by
		left join "user" t on t.id = j.technician_id
		left join log_chain_head h on h.shop_id = j.shop_id and h.job_id = j.id
		where j.shop_id = ${shopId} and j.id = ${jobId}`;
	return row ?? null;
}

/** Everything the pack shows but the photos' bytes. Null for a job not of this shop. */
export async function loadEvidence(
	client: Sql,
	shopId: string,
	jobId: string,
	now = new Date()
): Promise<EvidencePack | null> {
	const h = await header(client, shopId, jobId);
	if (!h) return null;
	// Who, which step's spec, which tool: read per entry next to the chain's own text forms.
	const extra = new Map<string, Record<string, unknown>>();
	const rows = await client`
		select e.id, a.name as author, a.role as author_role, st.label as step, st.unit as step_unit,
			st.nominal, st.min, st.max, tt.identifier as tool, tt.kind as tool_kind,
			tt.calibrated_on as tool_calibrated_on
		from log_entry e
		join "user" a on a.id = e.author_id
		left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
		left join torque_tool tt on tt.id = e.torque_tool_id and tt.shop_id = e.shop_id
		where e.shop_id = ${shopId} and e.job_id = ${jobId}`;
	for (const r of rows) extra.set(r.id, r);

	const entries: EvidenceEntry[] = [];
	await eachChainRow(client, { shopId, jobId }, (page) => {
		for (const row of page) {
			const fields = chainFields(row);
			const x = extra.get(String(row.id)) ?? {};
			entries.push({
				pos: Number(row.pos),
				id: String(row.id),
				kind: String(row.kind),
				source: String(row.source),
				text: String(row.raw_text),
				note: str(row.note),
				value: num(row.value),
				unit: str(row.unit),
				specValue: num(row.spec_value),
				specUnit: str(row.spec_unit),
				verdict: str(row.verdict),
				deviceTime: String(row.occurred_at),
				serverTime: String(row.recorded_at),
				author: str(x.author) ?? '?',
				authorRole: str(x.author_role) ?? '?',
				step: str(x.step),
				spec: x.step
					? { unit: str(x.step_unit), nominal: num(x.nominal), min: num(x.min), max: num(x.max) }
					: null,
				tool: x.tool
					? {
							identifier: String(x.tool),
							kind: str(x.tool_kind),
							calibrationOverdueAtTheTime: row.tool_calibration_overdue === 'true',
							calibratedOn: str(x.tool_calibrated_on)
						}
					: null,
				adapter:
					row.adapter_mm === null || row.adapter_mm === undefined
						? null
						: {
								mm: Number(row.adapter_mm),
								toolLengthMm: num(row.tool_length_mm),
								setting: num(row.wrench_setting),
								settingUnit: str(row.wrench_setting_unit)
							},
				retracts: str(row.retracts),
				respondsTo: str(row.responds_to),
				hash: String(row.entry_hash),
				prevHash: str(row.prev),
				canonical: canonicalJson(fields)
			});
		}
	});

	const photos = await client`
		select a.id, a.entry_id, a.file_name, a.mime, a.bytes, a.storage_key, a.thumb_key, a.sha256,
			a.created_at
		from attachment a where a.shop_id = ${shopId} and a.job_id = ${jobId}
		order by a.created_at, a.id`;
	const changes = await client`
		select c.from_state, c.to_state, c.reason, c.at, u.name as by
		from job_state_change c left join "user" u on u.id = c.by_user_id
		where c.shop_id = ${shopId} and c.job_id = ${jobId} order by c.at`;

	return {
		format: 'benchcall-evidence-pack/1',
		generatedAt: now.toISOString(),
		shop: String(h.shop_name),
		job: {
			id: String(h.id),
			number: Number(h.number),
			state: String(h.state),
			odometer: num(h.odometer),
			odometerUnit: String(h.odometer_unit),
			concern: String(h.concern ?? ''),
			bay: str(h.bay),
			technician: str(h.technician),
			openedAt: iso(h.created_at) ?? '',
			signedOffAt: iso(h.signed_off_at),
			signedOffBy: str(h.signed_off_by)
		},
		vehicle: h.vehicle_id
			? {
					id: String(h.vehicle_id),
					registration: String(h.registration),
					vin: str(h.frame_number),
					make: String(h.make),
					model: String(h.model),
					year: num(h.year),
					colour: str(h.colour)
				}
			: null,
		customer: h.customer_id ? { id: String(h.customer_id), name: String(h.customer_name) } : null,
		chain: { entries: num(h.head_pos) ?? 0, headHash: str(h.head_hash) },
		entries,
		stateChanges: changes.map((c) => ({
			from: str(c.from_state),
			to: String(c.to_state),
			reason: str(c.reason),
			at: iso(c.at) ?? '',
			by: str(c.by)
		})),
		photos: photos.map((p) => ({
			id: String(p.id),
			entryId: str(p.entry_id),
			fileName: String(p.file_name),
			mime: String(p.mime),
			bytes: Number(p.bytes),
			storageKey: String(p.storage_key),
			thumbKey: str(p.thumb_key),
			sha256: str(p.sha256),
			takenAt: iso(p.created_at) ?? ''
		}))
	};
}

/** The pack of the job with this card number in this shop; null for any other. */
export async function loadEvidenceByNumber(client: Sql, shopId: string, rawNumber: string) {
	const n = Number(rawNumber);
	if (!/^\d{1,9}$/.test(rawNumber) || !Number.isSafeInteger(n)) return null;
	const [row] = await client`select id from job where shop_id = ${shopId} and number = ${n}`;
	return row ? loadEvidence(client, shopId, String(row.id)) : null;
}
