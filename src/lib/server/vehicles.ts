// Vehicles and customers: finding a vehicle, its history (jobs, values per step across services,
// out-of-spec entries, photos), what is due next, and the reminder e-mail. Scoped by shop id.
import { failure, type Result } from '$lib/result';
import { shopFormat, type ShopStyle } from '$lib/format';
import { client } from './db';
import { liveCondition } from './log/live';
import { getShop } from './shop';
import { mailFrom, sendMail } from './mail';
import { normalizeRegistration, normalizeVin, toDate } from '$lib/vehicles/vin';
import type { JobState } from '$lib/jobs/states';
import { serviceDue, type DueItem, type LastDone, type Reading } from '$lib/vehicles/due';
import type { StepPoint, StepSeries, VehicleRow } from '$lib/vehicles/types';

export type { StepPoint, StepSeries, VehicleRow };

const SEARCH_LIMIT = 50;

const vehicleColumns = client`
	v.id, v.registration, v.frame_number as vin, v.make, v.model, v.year, v.colour,
	c.id as customer_id, c.name as customer_name, c.phone as customer_phone, c.email as customer_email,
	(select count(*)::int from job j where j.shop_id = v.shop_id and j.vehicle_id = v.id) as jobs,
	(select max(j.created_at) from job j where j.shop_id = v.shop_id and j.vehicle_id = v.id) as last_job_at,
	(select j.odometer from job j where j.shop_id = v.shop_id and j.vehicle_id = v.id
		and j.odometer is not null order by j.created_at desc limit 1) as last_odometer`;

function toVehicle(r: Record<string, unknown>): VehicleRow & {
	colour: string | null;
	customerEmail: string | null;
} {
	return {
		id: String(r.id),
		registration: String(r.registration),
		vin: (r.vin as string | null) ?? null,
		make: String(r.make),
		model: String(r.model),
		year: (r.year as number | null) ?? null,
		colour: (r.colour as string | null) ?? null,
		customerId: (r.customer_id as string | null) ?? null,
		customerName: (r.customer_name as string | null) ?? null,
		customerPhone: (r.customer_phone as string | null) ?? null,
		customerEmail: (r.customer_email as string | null) ?? null,
		jobs: Number(r.jobs ?? 0),
		lastJobAt: r.last_job_at ? toDate(r.last_job_at) : null,
		lastOdometer: (r.last_odometer as number | null) ?? null
	};
}

/**
 * Vehicles matching a registration or VIN (spaces, dashes and case ignored), a customer's name,
 * or a phone number (digits only compared). An empty query lists the latest vehicles.
 */
export async function searchVehicles(shopId: string, q: string) {
	const text = q.trim();
	const reg = normalizeRegistration(text);
	const vin = normalizeVin(text);
	const digits = text.replace(/\D/g, '');
	const like = `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
	const rows = await client`
		select ${vehicleColumns}
		from vehicle v left join customer c on c.id = v.customer_id and c.shop_id = v.shop_id
		where v.shop_id = ${shopId} and (${text} = ''
			or regexp_replace(upper(v.registration), '[[:space:]-]', '', 'g') like ${'%' + reg + '%'}
			or regexp_replace(upper(coalesce(v.frame_number, '')), '[[:space:].-]', '', 'g') like ${'%' + vin + '%'}
			or c.name ilike ${like}
			or (${digits.length >= 3} and regexp_replace(coalesce(c.phone, ''), '[^0-9]', '', 'g') like ${'%' + digits + '%'}))
		order by (regexp_replace(upper(v.registration), '[[:space:]-]', '', 'g') = ${reg}) desc,
			last_job_at desc nulls last, v.registration
		limit ${SEARCH_LIMIT}`;
	return rows.map(toVehicle);
}

export async function getVehicle(shopId: string, vehicleId: string) {
	const [row] = await client`
		select ${vehicleColumns}
		from vehicle v left join customer c on c.id = v.customer_id and c.shop_id = v.shop_id
		where v.shop_id = ${shopId} and v.id = ${vehicleId}`;
	return row ? toVehicle(row) : null;
}

export interface VehicleJob {
	id: string;
	number: number;
	openedAt: Date;
	odometer: number | null;
	odometerUnit: string;
	state: JobState;
	concern: string;
	procedures: string[];
}

export async function vehicleJobs(shopId: string, vehicleId: string): Promise<VehicleJob[]> {
	const rows = await client`
		select j.id, j.number, j.created_at, j.odometer, j.odometer_unit, j.state, j.concern,
			coalesce((select array_agg(p.name order by p.position) from job_procedure p
				where p.shop_id = j.shop_id and p.job_id = j.id), '{}') as procedures
		from job j where j.shop_id = ${shopId} and j.vehicle_id = ${vehicleId}
		order by j.created_at desc`;
	return rows.map((r) => ({
		id: r.id,
		number: r.number,
		openedAt: toDate(r.created_at),
		odometer: r.odometer,
		odometerUnit: r.odometer_unit,
		state: r.state,
		concern: r.concern,
		procedures: r.procedures
	}));
}

/**
 * Each step's measured values on this vehicle across its jobs (retracted entries left out),
 * oldest first; steps of different jobs are the same step when label and unit match.
 */
export async function stepSeries(
	shopId: string,
	vehicleId: string,
	labelLike?: string
): Promise<StepSeries[]> {
	const rows = await client`
		select e.id, j.number, e.occurred_at, e.spec_value, e.spec_unit, e.verdict, st.label,
			st.min, st.max
		from log_entry e
		join job j on j.id = e.job_id and j.shop_id = e.shop_id
		join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
		where e.shop_id = ${shopId} and j.vehicle_id = ${vehicleId} and e.kind = 'measure'
			and e.spec_value is not null
			and (${labelLike ?? null}::text is null or lower(st.label) = lower(${labelLike ?? null}::text))
			and ${client.unsafe(liveCondition('e'))}
		order by e.occurred_at`;
	const groups = new Map<string, StepSeries>();
	for (const r of rows) {
		const key = `${String(r.label).toLowerCase()}|${r.spec_unit}`;
		let g = groups.get(key);
		if (!g) groups.set(key, (g = { label: r.label, unit: r.spec_unit, points: [] }));
		g.points.push({
			entryId: r.id,
			jobNumber: r.number,
			on: toDate(r.occurred_at),
			value: r.spec_value,
			verdict: r.verdict,
			min: r.min,
			max: r.max
		});
	}
	return [...groups.values()].sort((a, b) => a.label.localeCompare(b.label));
}

/** Out-of-spec entries on this vehicle, newest first, with the foreman's answer if any. */
export async function outOfSpecHistory(shopId: string, vehicleId: string) {
	const rows = await client`
		select e.id, j.number, e.occurred_at, e.raw_text, e.spec_value, e.spec_unit, e.verdict,
			st.label, a.kind as answer, a.note as answer_note, u.name as answered_by,
			not ${client.unsafe(liveCondition('e'))} as retracted
		from log_entry e
		join job j on j.id = e.job_id and j.shop_id = e.shop_id
		left join job_step st on st.id = e.job_step_id and st.shop_id = e.shop_id
		left join lateral (select x.kind, x.note, x.author_id from log_entry x
			where x.shop_id = e.shop_id and x.responds_to = e.id and x.kind in ('accept', 'redo')
			order by x.chain_pos desc limit 1) a on true
		left join "user" u on u.id = a.author_id
		where e.shop_id = ${shopId} and j.vehicle_id = ${vehicleId} and e.verdict in ('low', 'high')
		order by e.occurred_at desc limit 200`;
	return rows.map((r) => ({
		id: r.id as string,
		jobNumber: r.number as number,
		on: toDate(r.occurred_at),
		text: r.raw_text as string,
		value: r.spec_value as number | null,
		unit: r.spec_unit as string | null,
		verdict: r.verdict as string,
		step: r.label as string | null,
		answer: r.answer as string | null,
		answerNote: r.answer_note as string | null,
		answeredBy: r.answered_by as string | null,
		retracted: Boolean(r.retracted)
	}));
}

export async function vehiclePhotos(shopId: string, vehicleId: string) {
	const rows = await client`
		select a.id, a.file_name, a.created_at, j.number
		from attachment a join job j on j.id = a.job_id and j.shop_id = a.shop_id
		where a.shop_id = ${shopId} and j.vehicle_id = ${vehicleId}
		order by a.created_at desc limit 60`;
	return rows.map((r) => ({
		id: r.id as string,
		fileName: r.file_name as string,
		takenAt: toDate(r.created_at),
		jobNumber: r.number as number
	}));
}

/** The facts service due is computed from, for a set of vehicles (all of the shop's if null). */
async function dueFacts(shopId: string, vehicleIds: string[] | null) {
	const ids = vehicleIds ?? null;
	const last = await client`
		select distinct on (j.vehicle_id, p.id) j.vehicle_id, p.id as procedure_id, p.name,
			p.interval_km, p.interval_months, j.number, j.created_at, j.odometer
		from job j
		join job_procedure jp on jp.job_id = j.id and jp.shop_id = j.shop_id
		join procedure p on p.id = jp.procedure_id and p.shop_id = j.shop_id
		where j.shop_id = ${shopId} and j.vehicle_id is not null
			and (p.interval_km is not null or p.interval_months is not null)
			and j.state not in ('cancelled')
			and (${ids}::uuid[] is null or j.vehicle_id = any(${ids}::uuid[]))
		order by j.vehicle_id, p.id, j.created_at desc`;
	const readings = await client`
		select j.vehicle_id, j.created_at, j.odometer from job j
		where j.shop_id = ${shopId} and j.odometer is not null and j.vehicle_id is not null
			and (${ids}::uuid[] is null or j.vehicle_id = any(${ids}::uuid[]))`;
	const byVehicle = new Map<
		string,
		{
			procs: Map<string, { name: string; km: number | null; months: number | null }>;
			last: LastDone[];
			readings: Reading[];
		}
	>();
	const of = (id: string) => {
		let v = byVehicle.get(id);
		if (!v) byVehicle.set(id, (v = { procs: new Map(), last: [], readings: [] }));
		return v;
	};
	for (const r of last) {
		const v = of(r.vehicle_id);
		v.procs.set(r.procedure_id, { name: r.name, km: r.interval_km, months: r.interval_months });
		v.last.push({
			procedureId: r.procedure_id,
			jobNumber: r.number,
			on: toDate(r.created_at),
			odometer: r.odometer
		});
	}
	for (const r of readings)
		of(r.vehicle_id).readings.push({ on: toDate(r.created_at), odometer: r.odometer });
	return byVehicle;
}

export async function vehicleDue(shopId: string, vehicleId: string, today = new Date()) {
	const facts = (await dueFacts(shopId, [vehicleId])).get(vehicleId);
	if (!facts) return [];
	const procs = [...facts.procs].map(([procedureId, p]) => ({
		procedureId,
		name: p.name,
		intervalKm: p.km,
		intervalMonths: p.months
	}));
	return serviceDue(procs, facts.last, facts.readings, today);
}

/** Vehicles with something overdue or due within `days`, soonest first (the Jobs filter). */
export async function vehiclesDueWithin(shopId: string, days: number, today = new Date()) {
	const facts = await dueFacts(shopId, null);
	const out: { vehicle: VehicleRow; items: DueItem[] }[] = [];
	const due = new Map<string, DueItem[]>();
	for (const [vehicleId, f] of facts) {
		const procs = [...f.procs].map(([procedureId, p]) => ({
			procedureId,
			name: p.name,
			intervalKm: p.km,
			intervalMonths: p.months
		}));
		const items = serviceDue(procs, f.last, f.readings, today, days).filter(
			(i) => i.state === 'overdue' || i.state === 'due_soon'
		);
		if (items.length) due.set(vehicleId, items);
	}
	if (due.size === 0) return out;
	const rows = await client`
		select ${vehicleColumns}
		from vehicle v left join customer c on c.id = v.customer_id and c.shop_id = v.shop_id
		where v.shop_id = ${shopId} and v.id = any(${[...due.keys()]}::uuid[])`;
	for (const r of rows) out.push({ vehicle: toVehicle(r), items: due.get(String(r.id))! });
	const first = (x: (typeof out)[number]) => x.items[0].nextOn?.getTime() ?? 0;
	return out.sort((a, b) => first(a) - first(b));
}

export async function getCustomer(shopId: string, customerId: string) {
	const [c] = await client`
		select id, name, phone, email, created_at from customer
		where shop_id = ${shopId} and id = ${customerId}`;
	if (!c) return null;
	const vehicles = await client`
		select ${vehicleColumns}
		from vehicle v left join customer c on c.id = v.customer_id and c.shop_id = v.shop_id
		where v.shop_id = ${shopId} and v.customer_id = ${customerId} order by v.registration`;
	const jobs = await client`
		select j.number, j.created_at, j.state, j.concern, j.odometer, j.odometer_unit, v.registration
		from job j left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		where j.shop_id = ${shopId} and j.customer_id = ${customerId}
		order by j.created_at desc limit 200`;
	return {
		customer: {
			id: c.id as string,
			name: c.name as string,
			phone: c.phone as string | null,
			email: c.email as string | null
		},
		vehicles: vehicles.map(toVehicle),
		jobs: jobs.map((j) => ({
			number: j.number as number,
			openedAt: toDate(j.created_at),
			state: j.state as JobState,
			concern: j.concern as string,
			odometer: j.odometer as number | null,
			odometerUnit: j.odometer_unit as string,
			registration: j.registration as string | null
		}))
	};
}

/** The reminder's words: what is due, by when or at what reading, and who to call. */
export function reminderText(
	shopName: string,
	vehicle: { registration: string; make: string; model: string; customerName: string | null },
	items: DueItem[],
	odometerUnit = 'km',
	style: Partial<ShopStyle> = {}
): string {
	// the shop's date and number style, as on its screens and invoices
	const fmt = shopFormat(style);
	const lines = items.map((i) => {
		const parts: string[] = [];
		if (i.dueOn) parts.push(`by ${fmt.date(i.dueOn)}`);
		if (i.dueAtOdometer !== null)
			parts.push(`at ${fmt.number(i.dueAtOdometer, 0)} ${odometerUnit}`);
		const when = parts.length ? ` ${parts.join(' or ')}, whichever comes first` : '';
		return `- ${i.name}: ${i.state === 'overdue' ? 'overdue' : 'due'}${when}`;
	});
	return [
		`Hello${vehicle.customerName ? ` ${vehicle.customerName}` : ''},`,
		'',
		`Our records show service work coming due for your ${vehicle.make} ${vehicle.model} (${vehicle.registration}):`,
		...lines,
		'',
		'Reply to this e-mail or call us to book a time.',
		'',
		shopName
	].join('\n');
}

/** Sends the customer a reminder of what is due through the outbox. */
export async function sendDueReminder(
	shopId: string,
	vehicleId: string,
	to: string,
	sentBy: string,
	shopName: string,
	today = new Date()
): Promise<Result<{ message: string }>> {
	const vehicle = await getVehicle(shopId, vehicleId);
	if (!vehicle) return failure('not_found', 'No such vehicle in this shop.');
	const items = (await vehicleDue(shopId, vehicleId, today)).filter(
		(i) => i.state === 'overdue' || i.state === 'due_soon' || i.state === 'later'
	);
	if (items.length === 0) {
		return failure('unprocessable', 'Nothing with a known due date: no reminder to send.');
	}
	return sendMail({
		shopId,
		sentBy,
		from: mailFrom(shopName),
		to,
		subject: `Service due for ${vehicle.registration} (${shopName})`,
		text: reminderText(shopName, vehicle, items, 'km', (await getShop(shopId)) ?? {})
	});
}
