// Benchcall's data model. drizzle-kit loads this file with its own loader:
// no `$lib` or `$env` imports here (STACK.md, trap 3).
import { sql } from 'drizzle-orm';
import {
	bigint,
	boolean,
	date,
	doublePrecision,
	foreignKey,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	smallint,
	text,
	timestamp,
	uniqueIndex,
	uuid
} from 'drizzle-orm/pg-core';

const id = () => uuid('id').primaryKey().defaultRandom();
/**
 * A shop table's id: its primary key is (shop_id, id), so an engine that distributes tables by
 * shop can enforce it (distribution.db.test.ts). Foreign keys between shop tables carry shop_id;
 * their `set null` clears only the id column in SQL (drizzle/0015: `SET NULL (col)`), which
 * drizzle cannot write. A query by id alone misses the key: give it the shop_id too.
 */
const rowId = () => uuid('id').notNull().defaultRandom();
const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();
const shopRef = () =>
	uuid('shop_id')
		.notNull()
		.references(() => shop.id, { onDelete: 'cascade' });

export const roleEnum = pgEnum('role', ['owner', 'service_writer', 'foreman', 'technician']);

export const shop = pgTable('shop', {
	id: id(),
	name: text('name').notNull(),
	/** ISO 4217 code, e.g. EUR. */
	currency: text('currency').notNull().default('EUR'),
	/** Labour rate per hour in the currency's minor units. */
	labourRateMinor: integer('labour_rate_minor').notNull().default(0),
	/** Tax rate in basis points (20 % = 2000). */
	taxRateBp: integer('tax_rate_bp').notNull().default(0),
	/** Tolerance applied to nominal-only specs, in percent: shop policy. */
	defaultTolerancePct: doublePrecision('default_tolerance_pct').notNull().default(10),
	/** Clock-time labour leaves out idle gaps longer than this. */
	idleGapMinutes: integer('idle_gap_minutes').notNull().default(30),
	/** Torque tools are due this many months after calibration unless the tool says otherwise. */
	calibrationMonths: integer('calibration_months').notNull().default(12),
	bays: text('bays')
		.array()
		.notNull()
		.default(sql`'{}'::text[]`),
	/** BCP 47 tag: how every date, time and number is written on screen, in PDFs and CSVs. */
	locale: text('locale').notNull().default('en-GB'),
	/** IANA zone: the shop's clock for dates shown and for phrases such as "at 10:30". */
	timeZone: text('time_zone').notNull().default('UTC'),
	createdAt: createdAt()
});
export type Shop = typeof shop.$inferSelect;

export const user = pgTable(
	'user',
	{
		id: id(),
		shopId: shopRef(),
		/** Stored lower-case; unique across Benchcall because it is the sign-in name. */
		email: text('email').notNull(),
		name: text('name').notNull(),
		role: roleEnum('role').notNull(),
		passwordHash: text('password_hash').notNull(),
		active: boolean('active').notNull().default(true),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('user_email_key').on(t.email), index('user_shop_idx').on(t.shopId)]
);
export type User = typeof user.$inferSelect;

export const session = pgTable(
	'session',
	{
		id: text('id').primaryKey(),
		userId: uuid('user_id')
			.notNull()
			.references(() => user.id, { onDelete: 'cascade' }),
		expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull()
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

/** Failed sign-ins, for throttling by e-mail and by address. */
export const signInFailure = pgTable(
	'sign_in_failure',
	{
		id: bigint('id', { mode: 'number' }).primaryKey().generatedAlwaysAsIdentity(),
		email: text('email').notNull(),
		address: text('address').notNull(),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('sign_in_failure_email_idx').on(t.email, t.at),
		index('sign_in_failure_address_idx').on(t.address, t.at)
	]
);

export const customer = pgTable(
	'customer',
	{
		id: rowId(),
		shopId: shopRef(),
		name: text('name').notNull(),
		phone: text('phone'),
		email: text('email'),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		index('customer_shop_idx').on(t.shopId, t.name),
		index('customer_name_trgm_idx').using('gin', sql`lower(${t.name}) gin_trgm_ops`)
	]
);
export type Customer = typeof customer.$inferSelect;

export const vehicle = pgTable(
	'vehicle',
	{
		id: rowId(),
		shopId: shopRef(),
		customerId: uuid('customer_id'),
		registration: text('registration').notNull(),
		frameNumber: text('frame_number'),
		/** Make and model as free text: Benchcall keeps no catalogue of makes. */
		make: text('make').notNull(),
		model: text('model').notNull(),
		year: integer('year'),
		colour: text('colour'),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'vehicle_customer_id_fk',
			columns: [t.shopId, t.customerId],
			foreignColumns: [customer.shopId, customer.id]
		}).onDelete('set null'),
		index('vehicle_shop_idx').on(t.shopId, t.registration),
		index('vehicle_registration_trgm_idx').using(
			'gin',
			sql`lower(regexp_replace(${t.registration}, '[\\s-]+', '', 'g')) gin_trgm_ops`
		)
	]
);
export type Vehicle = typeof vehicle.$inferSelect;

export const partUnitEnum = pgEnum('part_unit', ['each', 'L', 'mL']);

/** The price list: parts, consumables and fluids. */
export const part = pgTable(
	'part',
	{
		id: rowId(),
		shopId: shopRef(),
		code: text('code').notNull(),
		description: text('description').notNull(),
		unit: partUnitEnum('unit').notNull().default('each'),
		priceMinor: integer('price_minor').notNull(),
		/** A fluid's grade as the label writes it ("SAE 10W-30, API SN, JASO MA2", "DOT 4"). */
		fluid: text('fluid'),
		active: boolean('active').notNull().default(true),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		uniqueIndex('part_shop_code_key').on(t.shopId, t.code)
	]
);
export type Part = typeof part.$inferSelect;

export const torqueTool = pgTable(
	'torque_tool',
	{
		id: rowId(),
		shopId: shopRef(),
		identifier: text('identifier').notNull(),
		/** ISO 6789 type and class in words, e.g. "Type II class A click". */
		kind: text('kind').notNull(),
		rangeMin: doublePrecision('range_min').notNull(),
		rangeMax: doublePrecision('range_max').notNull(),
		/** UCUM code of the range. */
		unit: text('unit').notNull(),
		calibratedOn: date('calibrated_on', { mode: 'string' }),
		/** Overrides the shop's calibration interval when set. */
		intervalMonths: integer('interval_months'),
		/** From the centre of the drive to the handle's load mark, in mm: for adapter settings. */
		effectiveLengthMm: doublePrecision('effective_length_mm'),
		active: boolean('active').notNull().default(true),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		uniqueIndex('torque_tool_shop_identifier_key').on(t.shopId, t.identifier)
	]
);
export type TorqueTool = typeof torqueTool.$inferSelect;

/** One set value on the tester and what the tester showed at each reading. */
export interface CheckPoint {
	set: number;
	readings: number[];
}

/**
 * A torque tool's check against a tester (ISO 6789-2): the readings at each test point, the
 * permissible deviation applied and the outcome. Kept whole; a new check is a new row.
 */
export const torqueToolCheck = pgTable(
	'torque_tool_check',
	{
		id: rowId(),
		shopId: shopRef(),
		torqueToolId: uuid('torque_tool_id').notNull(),
		checkedOn: date('checked_on', { mode: 'string' }).notNull(),
		/** Who checked it, or the laboratory, as the owner writes it. */
		checkedBy: text('checked_by').notNull(),
		/** The tester or certificate used. */
		tester: text('tester').notNull().default(''),
		points: jsonb('points').$type<CheckPoint[]>().notNull(),
		/** Unit of the set values and readings (the tool's, UCUM). */
		unit: text('unit').notNull(),
		permissiblePct: doublePrecision('permissible_pct').notNull(),
		worstPct: doublePrecision('worst_pct').notNull(),
		passed: boolean('passed').notNull(),
		note: text('note'),
		recordedBy: uuid('recorded_by')
			.notNull()
			.references(() => user.id),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'torque_tool_check_torque_tool_id_fk',
			columns: [t.shopId, t.torqueToolId],
			foreignColumns: [torqueTool.shopId, torqueTool.id]
		}).onDelete('cascade'),
		index('torque_tool_check_tool_idx').on(t.torqueToolId, t.checkedOn)
	]
);
export type TorqueToolCheck = typeof torqueToolCheck.$inferSelect;

export const procedure = pgTable(
	'procedure',
	{
		id: rowId(),
		shopId: shopRef(),
		name: text('name').notNull(),
		appliesTo: text('applies_to').notNull().default(''),
		flatRateHours: doublePrecision('flat_rate_hours').notNull().default(0),
		archivedAt: timestamp('archived_at', { withTimezone: true }),
		/** Service interval: due again after this distance (in the job's odometer unit)… */
		intervalKm: integer('interval_km'),
		/** …or this many months, whichever comes first. Both null: no interval. */
		intervalMonths: integer('interval_months'),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		index('procedure_shop_idx').on(t.shopId, t.name)
	]
);
export type Procedure = typeof procedure.$inferSelect;

/** Spec columns shared by a library step and its copy on a job. */
const specColumns = () => ({
	label: text('label').notNull(),
	aliases: text('aliases')
		.array()
		.notNull()
		.default(sql`'{}'::text[]`),
	/** UCUM code; null for a step checked without a value (a test ride). */
	unit: text('unit'),
	nominal: doublePrecision('nominal'),
	min: doublePrecision('min'),
	max: doublePrecision('max'),
	caution: text('caution'),
	/** The fluid spec as the manual writes it ("SAE 10W-30, API SJ or higher, JASO MA", "DOT 4"). */
	fluid: text('fluid'),
	/**
	 * An adapter the step is done with (a crowfoot on a flare nut): its length in mm and how it
	 * sits on the wrench ('out', 'back', 'square'); both null when none. A said or picked adapter
	 * overrides it.
	 */
	adapterLengthMm: doublePrecision('adapter_length_mm'),
	adapterDirection: text('adapter_direction'),
	partId: uuid('part_id'),
	partQuantity: doublePrecision('part_quantity')
});

export const procedureStep = pgTable(
	'procedure_step',
	{
		id: rowId(),
		shopId: shopRef(),
		procedureId: uuid('procedure_id').notNull(),
		position: integer('position').notNull(),
		...specColumns()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'procedure_step_procedure_id_fk',
			columns: [t.shopId, t.procedureId],
			foreignColumns: [procedure.shopId, procedure.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'procedure_step_part_id_fk',
			columns: [t.shopId, t.partId],
			foreignColumns: [part.shopId, part.id]
		}).onDelete('set null'),
		index('procedure_step_procedure_idx').on(t.procedureId, t.position)
	]
);
export type ProcedureStep = typeof procedureStep.$inferSelect;

export const jobStateEnum = pgEnum('job_state', [
	'open',
	'in_work',
	'final_inspection',
	'ready_to_invoice',
	'invoiced',
	'paid',
	'on_hold',
	'cancelled'
]);

export const job = pgTable(
	'job',
	{
		id: rowId(),
		shopId: shopRef(),
		/** The job card number, counted per shop. */
		number: integer('number').notNull(),
		customerId: uuid('customer_id'),
		vehicleId: uuid('vehicle_id'),
		odometer: integer('odometer'),
		odometerUnit: text('odometer_unit').notNull().default('km'),
		fuelLevel: text('fuel_level'),
		damageNotes: text('damage_notes'),
		concern: text('concern').notNull().default(''),
		requestedWork: text('requested_work'),
		promisedAt: timestamp('promised_at', { withTimezone: true }),
		technicianId: uuid('technician_id').references(() => user.id, { onDelete: 'set null' }),
		bay: text('bay'),
		state: jobStateEnum('state').notNull().default('open'),
		stateReason: text('state_reason'),
		signedOffBy: uuid('signed_off_by').references(() => user.id, { onDelete: 'set null' }),
		signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
		createdBy: uuid('created_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		/**
		 * Bumped by triggers (drizzle/0005) whenever the job's steps or procedures change, so an
		 * app server may keep the steps in memory and know, from this one number, when to re-read.
		 */
		stepsVersion: integer('steps_version').notNull().default(0)
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'job_customer_id_fk',
			columns: [t.shopId, t.customerId],
			foreignColumns: [customer.shopId, customer.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'job_vehicle_id_fk',
			columns: [t.shopId, t.vehicleId],
			foreignColumns: [vehicle.shopId, vehicle.id]
		}).onDelete('set null'),
		uniqueIndex('job_shop_number_key').on(t.shopId, t.number),
		index('job_shop_state_idx').on(t.shopId, t.state),
		index('job_shop_created_idx').on(t.shopId, t.createdAt),
		index('job_shop_number_text_idx').on(t.shopId, sql`(${t.number}::text) text_pattern_ops`),
		index('job_shop_customer_idx').on(t.shopId, t.customerId),
		index('job_shop_vehicle_idx').on(t.shopId, t.vehicleId),
		index('job_technician_idx').on(t.technicianId)
	]
);
export type Job = typeof job.$inferSelect;

/** Every change of a job's state, with who and when. */
export const jobStateChange = pgTable(
	'job_state_change',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		fromState: jobStateEnum('from_state'),
		toState: jobStateEnum('to_state').notNull(),
		reason: text('reason'),
		byUserId: uuid('by_user_id').references(() => user.id, { onDelete: 'set null' }),
		at: timestamp('at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'job_state_change_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		index('job_state_change_job_idx').on(t.jobId, t.at)
	]
);

/** A procedure attached to a job: name and flat-rate hours copied at the time. */
export const jobProcedure = pgTable(
	'job_procedure',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		procedureId: uuid('procedure_id'),
		name: text('name').notNull(),
		flatRateHours: doublePrecision('flat_rate_hours').notNull().default(0),
		position: integer('position').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'job_procedure_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'job_procedure_procedure_id_fk',
			columns: [t.shopId, t.procedureId],
			foreignColumns: [procedure.shopId, procedure.id]
		}).onDelete('set null'),
		index('job_procedure_job_idx').on(t.jobId, t.position)
	]
);

/**
 * A step copied onto a job when its procedure is attached, so later library edits
 * never change a job's specs or a past verdict.
 */
export const jobStep = pgTable(
	'job_step',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		jobProcedureId: uuid('job_procedure_id').notNull(),
		procedureStepId: uuid('procedure_step_id'),
		position: integer('position').notNull(),
		...specColumns()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'job_step_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'job_step_job_procedure_id_fk',
			columns: [t.shopId, t.jobProcedureId],
			foreignColumns: [jobProcedure.shopId, jobProcedure.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'job_step_procedure_step_id_fk',
			columns: [t.shopId, t.procedureStepId],
			foreignColumns: [procedureStep.shopId, procedureStep.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'job_step_part_id_fk',
			columns: [t.shopId, t.partId],
			foreignColumns: [part.shopId, part.id]
		}).onDelete('set null'),
		index('job_step_job_idx').on(t.jobId, t.position),
		index('job_step_procedure_step_idx').on(t.procedureStepId)
	]
);
export type JobStep = typeof jobStep.$inferSelect;

export const entryKindEnum = pgEnum('entry_kind', [
	'measure',
	'part',
	'note',
	'done',
	'retraction',
	'accept',
	'redo',
	'inspection',
	'sign_off'
]);
export const entrySourceEnum = pgEnum('entry_source', ['typed', 'voice', 'system']);
export const verdictEnum = pgEnum('verdict', ['in', 'low', 'high', 'no_spec']);

/**
 * The job log. Append-only in the database: a trigger (see drizzle/) rejects UPDATE and
 * DELETE. A correction is a new entry; a retraction points at the entry it retracts.
 */
export const logEntry = pgTable(
	'log_entry',
	{
		/** Made on the device, so a resend of the same entry is recognised. */
		id: uuid('id').notNull(),
		/**
		 * The shop's order of arrival, for keyset pagination and live catch-up: set by a trigger
		 * from the shop's own sequence (drizzle/0015), whatever the default says. Rising within a
		 * shop, with gaps; never compared across shops.
		 */
		seq: bigint('seq', { mode: 'number' }).notNull().default(0),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		jobStepId: uuid('job_step_id'),
		authorId: uuid('author_id')
			.notNull()
			.references(() => user.id),
		kind: entryKindEnum('kind').notNull(),
		rawText: text('raw_text').notNull(),
		source: entrySourceEnum('source').notNull(),
		/** As called out. */
		value: doublePrecision('value'),
		unit: text('unit'),
		/** Converted into the spec's unit. */
		specValue: doublePrecision('spec_value'),
		specUnit: text('spec_unit'),
		verdict: verdictEnum('verdict'),
		/** The fluid grade as called out, normalised ("SAE 10W-30 · API SN · JASO MA2"). */
		fluid: text('fluid'),
		/** The grade against the step's fluid spec: 'meets', 'fails', 'not_stated'; null: no spec. */
		fluidVerdict: text('fluid_verdict'),
		note: text('note'),
		partId: uuid('part_id'),
		partQuantity: doublePrecision('part_quantity'),
		torqueToolId: uuid('torque_tool_id'),
		/** The torque tool was past its calibration due date when this entry was made. */
		toolCalibrationOverdue: boolean('tool_calibration_overdue').notNull().default(false),
		/** Adapter on the wrench, signed mm along the lever (negative: back; 0: at 90°). */
		adapterMm: doublePrecision('adapter_mm'),
		/** The tool's effective length when the entry was made, and the setting worked out. */
		toolLengthMm: doublePrecision('tool_length_mm'),
		wrenchSetting: doublePrecision('wrench_setting'),
		wrenchSettingUnit: text('wrench_setting_unit'),
		retracts: uuid('retracts'),
		/** For a foreman's accept or redo: the out-of-spec entry it answers. */
		respondsTo: uuid('responds_to'),
		/** For an inspection entry: the checklist item ticked. */
		inspectionItemId: uuid('inspection_item_id'),
		occurredAt: timestamp('occurred_at', { withTimezone: true }).notNull(),
		recordedAt: timestamp('recorded_at', { withTimezone: true }).notNull().defaultNow(),
		/**
		 * The hash chain (drizzle/0010): set by a trigger in the inserting statement, whatever the
		 * defaults say. Position in the job's own log (1, 2, …), the previous entry's hash, and
		 * SHA-256 over the entry's canonical JSON (src/lib/evidence/chain.ts).
		 */
		chainPos: integer('chain_pos').notNull().default(0),
		prevHash: text('prev_hash'),
		entryHash: text('entry_hash').notNull().default(''),
		/** The canonical form's version this entry was hashed with (1 before drizzle/0012). */
		chainV: smallint('chain_v').notNull().default(2)
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'log_entry_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'log_entry_job_step_id_fk',
			columns: [t.shopId, t.jobStepId],
			foreignColumns: [jobStep.shopId, jobStep.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'log_entry_part_id_fk',
			columns: [t.shopId, t.partId],
			foreignColumns: [part.shopId, part.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'log_entry_torque_tool_id_fk',
			columns: [t.shopId, t.torqueToolId],
			foreignColumns: [torqueTool.shopId, torqueTool.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'log_entry_retracts_fk',
			columns: [t.shopId, t.retracts],
			foreignColumns: [t.shopId, t.id]
		}),
		foreignKey({
			name: 'log_entry_responds_to_fk',
			columns: [t.shopId, t.respondsTo],
			foreignColumns: [t.shopId, t.id]
		}),
		foreignKey({
			name: 'log_entry_inspection_item_id_fk',
			columns: [t.shopId, t.inspectionItemId],
			foreignColumns: [inspectionItem.shopId, inspectionItem.id]
		}).onDelete('set null'),
		uniqueIndex('log_entry_shop_seq_key').on(t.shopId, t.seq),
		uniqueIndex('log_entry_job_chain_key').on(t.shopId, t.jobId, t.chainPos),
		index('log_entry_job_seq_idx').on(t.jobId, t.seq),
		index('log_entry_step_seq_idx').on(t.jobStepId, t.seq),
		index('log_entry_retracts_idx').on(t.retracts),
		index('log_entry_responds_to_idx').on(t.respondsTo)
		// drift reads drift_reading (drizzle/0017), not these two any more
	]
);
export type LogEntry = typeof logEntry.$inferSelect;

/**
 * The last link of each job's hash chain, kept by the chain trigger (drizzle/0010). Its row
 * lock orders a job's appends; its count and hash show when the newest entries were removed.
 */
export const logChainHead = pgTable(
	'log_chain_head',
	{
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		pos: integer('pos').notNull(),
		hash: text('hash')
	},
	(t) => [
		foreignKey({
			name: 'log_chain_head_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		primaryKey({ columns: [t.shopId, t.jobId] })
	]
);

/**
 * Derived from the log and kept by a trigger in each appending transaction (drizzle/0011): one
 * row per step that has entries. Rebuilt from the log by rebuild_log_state(shop).
 */
export const jobStepState = pgTable(
	'job_step_state',
	{
		shopId: shopRef(),
		jobStepId: uuid('job_step_id').notNull(),
		jobId: uuid('job_id').notNull(),
		done: boolean('done').notNull().default(false),
		latestMeasureId: uuid('latest_measure_id'),
		latestMeasureSeq: bigint('latest_measure_seq', { mode: 'number' }),
		latestVerdict: verdictEnum('latest_verdict'),
		waiting: boolean('waiting').notNull().default(false)
	},
	(t) => [
		foreignKey({
			name: 'job_step_state_job_step_id_fk',
			columns: [t.shopId, t.jobStepId],
			foreignColumns: [jobStep.shopId, jobStep.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'job_step_state_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		primaryKey({ columns: [t.shopId, t.jobStepId] }),
		index('job_step_state_job_idx').on(t.jobId),
		index('job_step_state_waiting_idx')
			.on(t.jobId, t.latestMeasureSeq)
			.where(sql`${t.waiting}`)
	]
);

/** Derived like job_step_state: a job's newest live entry time. */
export const jobLogState = pgTable(
	'job_log_state',
	{
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		lastEntryAt: timestamp('last_entry_at', { withTimezone: true })
	},
	(t) => [
		foreignKey({
			name: 'job_log_state_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		primaryKey({ columns: [t.shopId, t.jobId] }),
		index('job_log_state_last_entry_idx').on(t.shopId, t.lastEntryAt)
	]
);

/**
 * Derived like job_step_state (drizzle/0017): each live measurement with a value in its spec's
 * unit, with what drift draws (its step's nominal and label, its job's number), so drift for one
 * step or one torque tool reads its window from one index, not ~15 pages a reading through the
 * log, its job, its step and the retraction check. Kept by the append trigger and by a trigger on
 * job_step (a spec, label or library link edited); rebuilt by rebuild_log_state(shop).
 */
export const driftReading = pgTable(
	'drift_reading',
	{
		shopId: shopRef(),
		jobStepId: uuid('job_step_id').notNull(),
		entryId: uuid('entry_id').notNull(),
		jobId: uuid('job_id').notNull(),
		procedureStepId: uuid('procedure_step_id'),
		torqueToolId: uuid('torque_tool_id'),
		occurredAt: timestamp('occurred_at', { withTimezone: true }).notNull(),
		/** log_entry.spec_value and spec_unit */
		value: doublePrecision('value').notNull(),
		unit: text('unit').notNull(),
		/** The job step's unit, nominal (or middle of its band) and label as they stand now. */
		stepUnit: text('step_unit'),
		nominal: doublePrecision('nominal'),
		label: text('label').notNull(),
		verdict: verdictEnum('verdict'),
		jobNumber: integer('job_number').notNull()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.jobStepId, t.entryId] }),
		foreignKey({
			name: 'drift_reading_job_step_id_fk',
			columns: [t.shopId, t.jobStepId],
			foreignColumns: [jobStep.shopId, jobStep.id]
		}).onDelete('cascade'),
		index('drift_reading_step_idx')
			.on(t.shopId, t.procedureStepId, t.occurredAt)
			.where(sql`${t.procedureStepId} is not null`),
		index('drift_reading_tool_idx')
			.on(t.shopId, t.torqueToolId, t.occurredAt)
			.where(sql`${t.torqueToolId} is not null`)
	]
);

/** Photos: on an entry, or taken at intake. Files live behind the storage interface. */
export const attachment = pgTable(
	'attachment',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		entryId: uuid('entry_id'),
		fileName: text('file_name').notNull(),
		mime: text('mime').notNull(),
		bytes: integer('bytes').notNull(),
		storageKey: text('storage_key').notNull(),
		/** The downscaled copy (thumbs.ts), recorded once it is in storage; null until then. */
		thumbKey: text('thumb_key'),
		/** Failed tries to make the copy: the background backfill gives up after a few. */
		thumbTries: smallint('thumb_tries').notNull().default(0),
		/** SHA-256 of the original file, hex: printed in the evidence pack. */
		sha256: text('sha256'),
		uploadedBy: uuid('uploaded_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'attachment_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'attachment_entry_id_fk',
			columns: [t.shopId, t.entryId],
			foreignColumns: [logEntry.shopId, logEntry.id]
		}),
		index('attachment_job_idx').on(t.jobId),
		index('attachment_entry_idx').on(t.entryId),
		index('attachment_needs_copy_idx')
			.on(t.id)
			.where(sql`(thumb_key is null or sha256 is null) and thumb_tries < 3`)
	]
);

/** The shop's final-inspection checklist. Ticks are log entries of kind `inspection`. */
export const inspectionItem = pgTable(
	'inspection_item',
	{
		id: rowId(),
		shopId: shopRef(),
		label: text('label').notNull(),
		position: integer('position').notNull(),
		active: boolean('active').notNull().default(true),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		index('inspection_item_shop_idx').on(t.shopId, t.position)
	]
);

/** The customer's approval of extra work found during a job, recorded before steps are added. */
export const jobApproval = pgTable(
	'job_approval',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		description: text('description').notNull(),
		/** Who approved: the customer's name as they gave it. */
		approvedBy: text('approved_by').notNull(),
		/** How: in person, phone, e-mail, text message. */
		channel: text('channel').notNull(),
		approvedAt: timestamp('approved_at', { withTimezone: true }).notNull(),
		recordedBy: uuid('recorded_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'job_approval_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		index('job_approval_job_idx').on(t.jobId)
	]
);

// ——— Invoices, payments and e-mail ———

export const invoiceKindEnum = pgEnum('invoice_kind', ['invoice', 'credit_note']);
export const invoiceStatusEnum = pgEnum('invoice_status', ['draft', 'issued', 'paid', 'credited']);
export const labourModeEnum = pgEnum('labour_mode', ['flat_rate', 'clock']);

/**
 * An invoice or a credit note. A draft may change; issuing gives it the shop's next number and
 * freezes it: a mistake after issue is put right with a credit note (`creditFor`), never an edit.
 * Amounts are integers in the currency's minor units (ISO 4217 exponent).
 */
export const invoice = pgTable(
	'invoice',
	{
		id: rowId(),
		shopId: shopRef(),
		jobId: uuid('job_id').notNull(),
		kind: invoiceKindEnum('kind').notNull().default('invoice'),
		/** Null until issued; then the shop's next number, gapless. */
		number: integer('number'),
		status: invoiceStatusEnum('status').notNull().default('draft'),
		/** ISO 4217 code copied from the shop when the draft is made. */
		currency: text('currency').notNull(),
		labourMode: labourModeEnum('labour_mode').notNull().default('flat_rate'),
		labourRateMinor: integer('labour_rate_minor').notNull().default(0),
		taxRateBp: integer('tax_rate_bp').notNull().default(0),
		subtotalMinor: integer('subtotal_minor').notNull().default(0),
		taxMinor: integer('tax_minor').notNull().default(0),
		totalMinor: integer('total_minor').notNull().default(0),
		issuedAt: timestamp('issued_at', { withTimezone: true }),
		issuedBy: uuid('issued_by').references(() => user.id, { onDelete: 'set null' }),
		creditFor: uuid('credit_for'),
		/** The customer's private page `/r/<token>`: 256 random bits, base64url. */
		customerToken: text('customer_token').notNull(),
		/** The payment provider's checkout session for the total, once made. */
		checkoutSessionId: text('checkout_session_id'),
		paidAt: timestamp('paid_at', { withTimezone: true }),
		createdBy: uuid('created_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'invoice_job_id_fk',
			columns: [t.shopId, t.jobId],
			foreignColumns: [job.shopId, job.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'invoice_credit_for_fk',
			columns: [t.shopId, t.creditFor],
			foreignColumns: [t.shopId, t.id]
		}),
		uniqueIndex('invoice_shop_number_key').on(t.shopId, t.number),
		uniqueIndex('invoice_customer_token_key').on(t.customerToken, t.shopId),
		index('invoice_job_idx').on(t.shopId, t.jobId),
		index('invoice_checkout_session_idx').on(t.checkoutSessionId)
	]
);
export type Invoice = typeof invoice.$inferSelect;

export const invoiceLineKindEnum = pgEnum('invoice_line_kind', [
	'part',
	'fluid',
	'labour',
	'sundry',
	'discount'
]);

export const invoiceLine = pgTable(
	'invoice_line',
	{
		id: rowId(),
		shopId: shopRef(),
		invoiceId: uuid('invoice_id').notNull(),
		kind: invoiceLineKindEnum('kind').notNull(),
		description: text('description').notNull(),
		partId: uuid('part_id'),
		quantity: doublePrecision('quantity').notNull(),
		/** Price-list unit (each, L, mL) or h for labour. */
		unit: text('unit').notNull(),
		unitPriceMinor: integer('unit_price_minor').notNull(),
		amountMinor: integer('amount_minor').notNull(),
		taxRateBp: integer('tax_rate_bp').notNull().default(0),
		taxMinor: integer('tax_minor').notNull().default(0),
		/** No price-list match yet: the service writer picks a part before issuing. */
		unmatched: boolean('unmatched').notNull().default(false),
		/** The log entry or step the line came from, when it came from the log. */
		sourceEntryId: uuid('source_entry_id'),
		sourceStepId: uuid('source_step_id'),
		position: integer('position').notNull()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'invoice_line_invoice_id_fk',
			columns: [t.shopId, t.invoiceId],
			foreignColumns: [invoice.shopId, invoice.id]
		}).onDelete('cascade'),
		foreignKey({
			name: 'invoice_line_part_id_fk',
			columns: [t.shopId, t.partId],
			foreignColumns: [part.shopId, part.id]
		}).onDelete('set null'),
		foreignKey({
			name: 'invoice_line_source_entry_id_fk',
			columns: [t.shopId, t.sourceEntryId],
			foreignColumns: [logEntry.shopId, logEntry.id]
		}),
		foreignKey({
			name: 'invoice_line_source_step_id_fk',
			columns: [t.shopId, t.sourceStepId],
			foreignColumns: [jobStep.shopId, jobStep.id]
		}).onDelete('set null'),
		index('invoice_line_invoice_idx').on(t.invoiceId, t.position)
	]
);
export type InvoiceLine = typeof invoiceLine.$inferSelect;

/** The next invoice number of each shop, taken with `update … returning` while issuing. */
export const invoiceCounter = pgTable('invoice_counter', {
	shopId: uuid('shop_id')
		.primaryKey()
		.references(() => shop.id, { onDelete: 'cascade' }),
	nextNumber: integer('next_number').notNull().default(1)
});

export const paymentMethodEnum = pgEnum('payment_method', ['cash', 'card', 'online']);

export const payment = pgTable(
	'payment',
	{
		id: rowId(),
		shopId: shopRef(),
		invoiceId: uuid('invoice_id').notNull(),
		method: paymentMethodEnum('method').notNull(),
		amountMinor: integer('amount_minor').notNull(),
		/** The provider's id (checkout session or payment); unique so a repeat cannot pay twice. */
		providerReference: text('provider_reference'),
		receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
		recordedBy: uuid('recorded_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'payment_invoice_id_fk',
			columns: [t.shopId, t.invoiceId],
			foreignColumns: [invoice.shopId, invoice.id]
		}).onDelete('cascade'),
		uniqueIndex('payment_provider_reference_key').on(t.shopId, t.providerReference),
		index('payment_invoice_idx').on(t.invoiceId)
	]
);
export type Payment = typeof payment.$inferSelect;

/** Webhook events already handled, so a repeated delivery changes nothing. */
export const webhookEvent = pgTable(
	'webhook_event',
	{
		eventId: text('event_id').notNull(),
		shopId: shopRef(),
		type: text('type').notNull(),
		receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.shopId, t.eventId] })]
);

export const mailStatusEnum = pgEnum('mail_status', ['sent', 'failed']);

/** Every e-mail Benchcall sent, as sent (RFC 5322 source), for the shop's outbox page. */
export const mailOutbox = pgTable(
	'mail_outbox',
	{
		id: rowId(),
		shopId: shopRef(),
		invoiceId: uuid('invoice_id'),
		toAddress: text('to_address').notNull(),
		subject: text('subject').notNull(),
		messageId: text('message_id'),
		status: mailStatusEnum('status').notNull(),
		/** The transport's answer, or the error. */
		response: text('response'),
		raw: text('raw').notNull(),
		sentBy: uuid('sent_by').references(() => user.id, { onDelete: 'set null' }),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.shopId, t.id] }),
		foreignKey({
			name: 'mail_outbox_invoice_id_fk',
			columns: [t.shopId, t.invoiceId],
			foreignColumns: [invoice.shopId, invoice.id]
		}).onDelete('set null'),
		index('mail_outbox_shop_idx').on(t.shopId, t.createdAt)
	]
);
export type MailOutbox = typeof mailOutbox.$inferSelect;
