// Seeds the demo shop: an invented workshop, staff, customers, motorcycles, procedures with
// demo specs (not from any maker's manual), a price list, torque tools and jobs in several
// states with some log entries. Run by `npm start` and `npm test` on an empty database.
import { and, eq } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/postgres-js';
import postgres from 'postgres';
import * as s from '../src/lib/server/db/schema.ts';
import { activeStates } from '../src/lib/jobs/states.ts';
import { hashPassword } from '../src/lib/server/password.ts';
import {
	demoAccounts,
	demoPassword,
	demoShopName,
	otherAccounts,
	otherShopName
} from './lib/demo.js';

const url = process.env.DATABASE_URL;
if (!url) {
	console.error('DATABASE_URL is not set.');
	process.exit(2);
}
const client = postgres(url, { max: 1, onnotice: () => {} });
const db = drizzle(client, { schema: s });

const C = {
	lift: 'Support the motorcycle securely on a stand. Take the engine weight on a jack or engine stand and lift and align it with a helper; keep fingers out of mounting holes while aligning.',
	exhaust:
		'Exhaust and engine stay hot after running: let them cool before touching. Exhaust gas contains carbon monoxide: run the engine only with good ventilation or exhaust extraction, never in a closed room.',
	fuel: 'Petrol is highly flammable and its vapour explosive: no flames or sparks, wipe spills, keep fuel away from the hot exhaust.',
	battery:
		'Battery: disconnect the negative terminal first and reconnect it last. Battery gas is explosive and electrolyte corrosive: wear eye protection.',
	safetyJoint:
		'Safety-critical joint: use a calibrated torque wrench. An out-of-spec value here means stop and tell the foreman.',
	testRide:
		'Before the test ride: brakes, throttle return, lights and horn checked; wear protective gear. Run-up outdoors or with exhaust extraction only.'
};

type StepSeed = {
	label: string;
	aliases?: string[];
	unit?: string;
	nominal?: number;
	min?: number;
	max?: number;
	caution?: string;
	/** Demo value: an invented fluid spec, written the way manuals write one. */
	fluid?: string;
	/** Demo value: the adapter the step is done with (a crowfoot), length in mm. */
	adapter?: { lengthMm: number; direction: 'out' | 'back' | 'square' };
	part?: string;
	qty?: number;
};

const procedures: {
	name: string;
	appliesTo: string;
	hours: number;
	/** Demo service interval: due again after this distance or these months. */
	every?: { km: number; months: number };
	steps: StepSeed[];
}[] = [
	{
		name: 'Periodic service, 6 000 km (demo specs)',
		appliesTo: 'Small single-cylinder motorcycles, 125–300 cc',
		hours: 1.5,
		every: { km: 6000, months: 12 },
		steps: [
			{
				label: 'Engine oil drain plug',
				aliases: ['drain plug', 'sump plug'],
				unit: 'N.m',
				nominal: 24,
				min: 22,
				max: 26,
				caution: 'Hot oil scalds: let the engine cool before draining.',
				part: 'DPW-12',
				qty: 1
			},
			{
				label: 'Oil filter cover bolts',
				aliases: ['filter cover'],
				unit: 'N.m',
				nominal: 10,
				min: 9,
				max: 11,
				part: 'OF-110',
				qty: 1
			},
			{
				label: 'Engine oil fill',
				aliases: ['oil', 'engine oil', 'oil fill'],
				unit: 'L',
				nominal: 1.1,
				min: 1.0,
				max: 1.2,
				fluid: 'SAE 10W-40, API SL or higher, JASO MA2', // demo value
				part: 'OIL-1040',
				qty: 1.1
			},
			{
				label: 'Spark plug',
				aliases: ['plug'],
				unit: 'kgf.m',
				nominal: 1.3,
				min: 1.2,
				max: 1.4,
				part: 'SP-8',
				qty: 1
			},
			{
				label: 'Valve clearance intake',
				aliases: ['intake valve', 'inlet clearance'],
				unit: 'mm',
				nominal: 0.1,
				min: 0.08,
				max: 0.12
			},
			{
				label: 'Valve clearance exhaust',
				aliases: ['exhaust valve'],
				unit: 'mm',
				nominal: 0.18,
				min: 0.16,
				max: 0.2
			},
			{
				label: 'Throttle grip free play',
				aliases: ['throttle play', 'throttle free play'],
				unit: 'mm',
				min: 2,
				max: 6
			},
			{
				label: 'Clutch lever free play',
				aliases: ['clutch play', 'clutch lever'],
				unit: 'mm',
				min: 10,
				max: 20
			},
			{
				label: 'Drive chain slack',
				aliases: ['chain slack', 'chain'],
				unit: 'mm',
				min: 25,
				max: 35
			},
			{
				label: 'Rear axle nut',
				aliases: ['rear axle', 'axle nut'],
				unit: 'N.m',
				nominal: 88,
				min: 80,
				max: 96,
				caution: C.safetyJoint
			},
			{
				label: 'Front tyre pressure',
				aliases: ['front tyre', 'front tire'],
				unit: 'kPa',
				nominal: 200,
				min: 190,
				max: 210
			},
			{
				label: 'Rear tyre pressure',
				aliases: ['rear tyre', 'rear tire'],
				unit: 'kPa',
				nominal: 225,
				min: 215,
				max: 235
			},
			{
				label: 'Battery voltage',
				aliases: ['battery'],
				unit: 'V',
				min: 12.4,
				max: 13.2,
				caution: C.battery
			},
			{
				label: 'Idle speed',
				aliases: ['idle', 'tickover'],
				unit: '/min',
				nominal: 1400,
				min: 1300,
				max: 1500,
				caution: C.exhaust
			},
			{ label: 'Test ride', aliases: ['road test'], caution: C.testRide }
		]
	},
	{
		name: 'Engine removal and refit (demo specs)',
		appliesTo: 'Small single-cylinder motorcycles with a cradle frame',
		hours: 5.5,
		steps: [
			{ label: 'Disconnect battery', aliases: ['battery off'], caution: C.battery },
			{ label: 'Drain fuel and close the tap', aliases: ['fuel drained'], caution: C.fuel },
			{ label: 'Support engine on jack', aliases: ['engine supported', 'jack'], caution: C.lift },
			{
				label: 'Upper engine mount bolt',
				aliases: ['upper mount', 'top mount'],
				unit: 'kgf.m',
				nominal: 5.0,
				caution: C.lift + ' ' + C.safetyJoint
			},
			{
				label: 'Front engine mount bolts',
				aliases: ['front mount'],
				unit: 'kgf.m',
				nominal: 3.3,
				min: 3.0,
				max: 3.6,
				caution: C.safetyJoint
			},
			{
				label: 'Lower engine mount bolt',
				aliases: ['lower mount', 'bottom mount'],
				unit: 'N.m',
				nominal: 55,
				min: 50,
				max: 60,
				caution: C.safetyJoint
			},
			{
				label: 'Exhaust header nuts',
				aliases: ['header nuts', 'exhaust nuts'],
				unit: 'N.m',
				nominal: 20,
				min: 18,
				max: 22,
				caution: C.exhaust,
				adapter: { lengthMm: 45, direction: 'out' }, // demo value: a crowfoot past the frame
				part: 'EXG-32',
				qty: 1
			},
			{
				label: 'Muffler mounting bolt',
				aliases: ['muffler bolt', 'silencer bolt'],
				unit: '[lbf_av].[ft_i]',
				nominal: 20,
				min: 18,
				max: 22
			},
			{
				label: 'Drive sprocket bolts',
				aliases: ['front sprocket bolts'],
				unit: 'N.m',
				nominal: 12,
				min: 11,
				max: 13
			},
			{
				label: 'Engine oil drain plug',
				aliases: ['drain plug'],
				unit: 'N.m',
				nominal: 24,
				min: 22,
				max: 26,
				part: 'DPW-12',
				qty: 1
			},
			{
				label: 'Engine oil fill',
				aliases: ['oil', 'engine oil'],
				unit: 'L',
				nominal: 1.3,
				min: 1.25,
				max: 1.35,
				fluid: 'SAE 10W-40, API SJ or higher, JASO MA', // demo value
				part: 'OIL-1040',
				qty: 1.3
			},
			{
				label: 'Clutch cable free play',
				aliases: ['clutch cable', 'clutch play'],
				unit: 'mm',
				min: 10,
				max: 15
			},
			{
				label: 'Throttle cable free play',
				aliases: ['throttle cable', 'throttle play'],
				unit: 'mm',
				min: 3,
				max: 5
			},
			{ label: 'Cables and wiring routed and clamped', aliases: ['cable routing', 'wiring'] },
			{ label: 'Reconnect battery', aliases: ['battery on'], caution: C.battery },
			{
				label: 'Idle speed',
				aliases: ['idle'],
				unit: '/min',
				nominal: 1400,
				min: 1300,
				max: 1500,
				caution: C.exhaust
			},
			{ label: 'Leak check after warm-up', aliases: ['leak check'], caution: C.exhaust },
			{ label: 'Test ride', aliases: ['road test'], caution: C.testRide }
		]
	},
	{
		name: 'Drive chain and sprocket renewal (demo specs)',
		appliesTo: 'Chain-drive motorcycles up to 400 cc',
		hours: 1.8,
		steps: [
			{
				label: 'New drive chain fitted',
				aliases: ['chain fitted', 'new chain'],
				part: 'CH-428-118',
				qty: 1
			},
			{
				label: 'Front sprocket nut',
				aliases: ['front sprocket', 'countershaft nut'],
				unit: 'N.m',
				nominal: 65,
				min: 60,
				max: 70,
				part: 'SPR-F14',
				qty: 1
			},
			{
				label: 'Rear sprocket nuts',
				aliases: ['rear sprocket'],
				unit: '[lbf_av].[ft_i]',
				nominal: 30,
				min: 28,
				max: 33,
				part: 'SPR-R45',
				qty: 1
			},
			{ label: 'Chain joint link staked', aliases: ['joint link', 'master link'] },
			{
				label: 'Drive chain slack',
				aliases: ['chain slack', 'slack'],
				unit: 'mm',
				min: 20,
				max: 30
			},
			{ label: 'Wheel alignment marks', aliases: ['alignment'] },
			{
				label: 'Rear axle nut',
				aliases: ['rear axle', 'axle nut'],
				unit: 'N.m',
				nominal: 88,
				min: 80,
				max: 96,
				caution: C.safetyJoint
			},
			{ label: 'Chain lubricated', aliases: ['chain lube'], part: 'LUBE-400', qty: 1 },
			{ label: 'Test ride', aliases: ['road test'], caution: C.testRide }
		]
	}
];

const parts = [
	{
		code: 'OIL-1040',
		description: 'Engine oil SAE 10W-40, API SL, JASO MA2 (bulk)',
		unit: 'L' as const,
		priceMinor: 1490,
		fluid: 'SAE 10W-40 · API SL · JASO MA2'
	},
	{
		code: 'DPW-12',
		description: 'Drain plug sealing washer 12 mm',
		unit: 'each' as const,
		priceMinor: 120
	},
	{
		code: 'OF-110',
		description: 'Oil filter element with O-rings',
		unit: 'each' as const,
		priceMinor: 890
	},
	{
		code: 'SP-8',
		description: 'Spark plug, resistor type',
		unit: 'each' as const,
		priceMinor: 760
	},
	{ code: 'EXG-32', description: 'Exhaust port gasket', unit: 'each' as const, priceMinor: 450 },
	{ code: 'OR-CL', description: 'Clutch cover O-ring', unit: 'each' as const, priceMinor: 310 },
	{
		code: 'GSK-CC',
		description: 'Crankcase cover gasket',
		unit: 'each' as const,
		priceMinor: 1280
	},
	{
		code: 'CH-428-118',
		description: 'Drive chain 428, 118 links, with joint link',
		unit: 'each' as const,
		priceMinor: 3950
	},
	{ code: 'SPR-F14', description: 'Front sprocket 14T', unit: 'each' as const, priceMinor: 1690 },
	{ code: 'SPR-R45', description: 'Rear sprocket 45T', unit: 'each' as const, priceMinor: 3480 },
	{
		code: 'LUBE-400',
		description: 'Chain lube spray 400 mL',
		unit: 'each' as const,
		priceMinor: 990
	},
	{ code: 'FORK-10', description: 'Fork oil 10W (bulk)', unit: 'L' as const, priceMinor: 2200 },
	{
		code: 'BRK-DOT4',
		description: 'Brake fluid DOT 4 (bulk)',
		unit: 'L' as const,
		priceMinor: 1800,
		fluid: 'DOT 4'
	}
];

async function main() {
	const existing = await db.select({ id: s.shop.id }).from(s.shop).limit(1);
	if (existing.length > 0) {
		console.log('  The database already holds a shop: nothing seeded.');
		return;
	}
	const passwordHash = await hashPassword(demoPassword);
	const serverTimeZone = Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';

	await db.transaction(async (tx) => {
		const [shop] = await tx
			.insert(s.shop)
			.values({
				name: demoShopName,
				currency: 'EUR',
				labourRateMinor: 7200,
				taxRateBp: 2000,
				bays: ['Bay 1', 'Bay 2', 'Bay 3', 'Bay 4'],
				// the shop keeps the server's clock; the owner changes it under Shop settings
				timeZone: serverTimeZone
			})
			.returning();

		const staff = await tx
			.insert(s.user)
			.values(demoAccounts.map((a) => ({ ...a, shopId: shop.id, passwordHash })))
			.returning();
		const byRole = (role: string, n = 0) => staff.filter((u) => u.role === role)[n];
		const writer = byRole('service_writer');
		const tomasz = byRole('technician', 0);
		const ruth = byRole('technician', 1);

		const partRows = await tx
			.insert(s.part)
			.values(parts.map((p) => ({ ...p, shopId: shop.id })))
			.returning();
		const partId = (code?: string) => partRows.find((p) => p.code === code)?.id ?? null;

		const tools = await tx
			.insert(s.torqueTool)
			.values([
				{
					shopId: shop.id,
					identifier: 'TW-01',
					kind: 'Type II class A click',
					rangeMin: 5,
					rangeMax: 60,
					unit: 'N.m',
					calibratedOn: '2026-03-10',
					effectiveLengthMm: 310 // demo value
				},
				{
					shopId: shop.id,
					identifier: 'TW-02',
					kind: 'Type II class A click',
					rangeMin: 40,
					rangeMax: 200,
					unit: 'N.m',
					calibratedOn: '2025-10-01',
					effectiveLengthMm: 480 // demo value
				},
				{
					shopId: shop.id,
					identifier: 'TW-03',
					kind: 'Type I class A dial',
					rangeMin: 1,
					rangeMax: 25,
					unit: 'N.m',
					calibratedOn: '2026-09-15'
				}
			])
			.returning();
		// Demo checks against the shop's tester (invented readings): TW-01 passed at its last
		// calibration; TW-02 failed two days ago, so its recent work shows as work to look at again.
		const owner = byRole('owner');
		const day = (daysAgo: number) =>
			new Date(Date.now() - daysAgo * 86_400_000).toISOString().slice(0, 10);
		await tx.insert(s.torqueToolCheck).values([
			{
				shopId: shop.id,
				torqueToolId: tools[0].id,
				checkedOn: '2026-03-10',
				checkedBy: 'Calibration service (demo)',
				tester: 'Certificate DEMO-0310',
				points: [
					{ set: 12, readings: [12.2, 11.9, 12.1, 12.3, 12] },
					{ set: 36, readings: [36.5, 35.8, 36.9, 36.2, 35.6] },
					{ set: 60, readings: [61.1, 59.4, 60.8, 61.5, 60.2] }
				],
				unit: 'N.m',
				permissiblePct: 4,
				worstPct: 2.5,
				passed: true,
				recordedBy: owner.id
			},
			{
				shopId: shop.id,
				torqueToolId: tools[1].id,
				checkedOn: day(2),
				checkedBy: owner.name,
				tester: 'Bench tester (demo)',
				points: [
					{ set: 40, readings: [41.1, 40.6, 41.4, 40.9, 41.2] },
					{ set: 120, readings: [123.1, 122.6, 123.9, 122.2, 123.4] },
					{ set: 200, readings: [207.4, 209.6, 206.8, 208.9, 207.7] }
				],
				unit: 'N.m',
				permissiblePct: 4,
				worstPct: 4.8,
				passed: false,
				note: 'Reads high at the top of its range; sent for adjustment (demo).',
				recordedBy: owner.id
			}
		]);

		const procRows = [];
		for (const p of procedures) {
			const [row] = await tx
				.insert(s.procedure)
				.values({
					shopId: shop.id,
					name: p.name,
					appliesTo: p.appliesTo,
					flatRateHours: p.hours,
					intervalKm: p.every?.km ?? null,
					intervalMonths: p.every?.months ?? null
				})
				.returning();
			const steps = await tx
				.insert(s.procedureStep)
				.values(
					p.steps.map((st, i) => ({
						shopId: shop.id,
						procedureId: row.id,
						position: i + 1,
						label: st.label,
						aliases: st.aliases ?? [],
						unit: st.unit ?? null,
						nominal: st.nominal ?? null,
						min: st.min ?? null,
						max: st.max ?? null,
						caution: st.caution ?? null,
						fluid: st.fluid ?? null,
						adapterLengthMm: st.adapter?.lengthMm ?? null,
						adapterDirection: st.adapter?.direction ?? null,
						partId: partId(st.part),
						partQuantity: st.qty ?? null
					}))
				)
				.returning();
			procRows.push({ row, steps });
		}

		// The default final-inspection checklist (common workshop practice); the owner edits it.
		await tx
			.insert(s.inspectionItem)
			.values(
				[
					'No leaks (oil, fuel, brake fluid)',
					'Exhaust sealed at the port and joints',
					'Throttle returns freely at every steering position',
					'Brakes: lever and pedal feel, operation',
					'Lights and horn',
					'Chain slack and wheel alignment',
					'Cables and wiring routed without pinching',
					'Test ride'
				].map((label, i) => ({ shopId: shop.id, label, position: i + 1 }))
			);

		const customers = await tx
			.insert(s.customer)
			.values([
				{
					shopId: shop.id,
					name: 'Aoife Brennan-Kato',
					phone: '+00 555 0141',
					email: 'aoife@example.test'
				},
				{
					shopId: shop.id,
					name: 'Samir Oduya',
					phone: '+00 555 0177',
					email: 'samir@example.test'
				},
				{
					shopId: shop.id,
					name: 'Lotte van Riemsdijk',
					phone: '+00 555 0102',
					email: 'lotte@example.test'
				},
				{
					shopId: shop.id,
					name: 'Courier Co-op Eastside',
					phone: '+00 555 0190',
					email: 'fleet@example.test'
				}
			])
			.returning();

		const vehicles = await tx
			.insert(s.vehicle)
			.values([
				{
					shopId: shop.id,
					customerId: customers[0].id,
					registration: 'KS 24 LMB',
					frameNumber: 'VNT250D0000418',
					make: 'Vantorra',
					model: 'Strada 250',
					year: 2021,
					colour: 'Slate blue'
				},
				{
					shopId: shop.id,
					customerId: customers[1].id,
					registration: 'KS 19 QRT',
					frameNumber: 'CRV400T0001173',
					make: 'Corvane',
					model: 'Trailhand 400',
					year: 2019,
					colour: 'Sand'
				},
				{
					shopId: shop.id,
					customerId: customers[2].id,
					registration: 'KS 22 HPX',
					frameNumber: 'QLN150S0002290',
					make: 'Quillon',
					model: 'Pico 150 scooter',
					year: 2022,
					colour: 'Mint'
				},
				{
					shopId: shop.id,
					customerId: customers[3].id,
					registration: 'KS 23 FLC',
					frameNumber: 'VNT125C0000951',
					make: 'Vantorra',
					model: 'Cargo 125',
					year: 2023,
					colour: 'White'
				}
			])
			.returning();

		const now = Date.now();
		const ago = (minutes: number) => new Date(now - minutes * 60_000);

		// Only a job on the floor takes entries (drizzle/0013): a job whose demo history ends ready
		// to invoice, invoiced, paid or cancelled is written in work, its log filled, then moved.
		const closeAtEnd: { id: string; state: (typeof s.jobStateEnum.enumValues)[number] }[] = [];

		/** Creates a job card with procedures copied onto it, like intake does. */
		async function makeJob(opts: {
			number: number;
			vehicle: number;
			procs: number[];
			state: (typeof s.jobStateEnum.enumValues)[number];
			tech: typeof tomasz | null;
			bay: string | null;
			concern: string;
			odometer: number;
			createdMinutesAgo: number;
			reason?: string;
		}) {
			const v = vehicles[opts.vehicle];
			const [j] = await tx
				.insert(s.job)
				.values({
					shopId: shop.id,
					number: opts.number,
					customerId: v.customerId,
					vehicleId: v.id,
					odometer: opts.odometer,
					fuelLevel: 'half',
					concern: opts.concern,
					technicianId: opts.tech?.id ?? null,
					bay: opts.bay,
					state: activeStates.includes(opts.state) ? opts.state : 'in_work',
					stateReason: opts.reason ?? null,
					createdBy: writer.id,
					createdAt: ago(opts.createdMinutesAgo)
				})
				.returning();
			if (!activeStates.includes(opts.state)) closeAtEnd.push({ id: j.id, state: opts.state });
			await tx.insert(s.jobStateChange).values({
				shopId: shop.id,
				jobId: j.id,
				fromState: null,
				toState: 'open',
				byUserId: writer.id,
				at: ago(opts.createdMinutesAgo)
			});
			if (opts.state !== 'open') {
				await tx.insert(s.jobStateChange).values({
					shopId: shop.id,
					jobId: j.id,
					fromState: 'open',
					toState: opts.state,
					reason: opts.reason ?? null,
					byUserId: opts.state === 'on_hold' ? writer.id : (opts.tech?.id ?? writer.id),
					at: ago(opts.createdMinutesAgo - 10)
				});
			}
			const jobSteps: (typeof s.jobStep.$inferSelect)[] = [];
			for (const [pos, pi] of opts.procs.entries()) {
				const p = procRows[pi];
				const [jp] = await tx
					.insert(s.jobProcedure)
					.values({
						shopId: shop.id,
						jobId: j.id,
						procedureId: p.row.id,
						name: p.row.name,
						flatRateHours: p.row.flatRateHours,
						position: pos + 1
					})
					.returning();
				const copied = await tx
					.insert(s.jobStep)
					.values(
						p.steps.map((st) => ({
							shopId: shop.id,
							jobId: j.id,
							jobProcedureId: jp.id,
							procedureStepId: st.id,
							position: pos * 100 + st.position,
							label: st.label,
							aliases: st.aliases,
							unit: st.unit,
							nominal: st.nominal,
							min: st.min,
							max: st.max,
							caution: st.caution,
							fluid: st.fluid,
							adapterLengthMm: st.adapterLengthMm,
							adapterDirection: st.adapterDirection,
							partId: st.partId,
							partQuantity: st.partQuantity
						}))
					)
					.returning();
				jobSteps.push(...copied);
			}
			return { job: j, steps: jobSteps };
		}

		/** Logs a measurement in the step's own unit, judged against the step's band. */
		function judge(step: typeof s.jobStep.$inferSelect, value: number) {
			const tol = 0.1;
			const lo =
				step.min ?? (step.max === null && step.nominal !== null ? step.nominal * (1 - tol) : null);
			const hi =
				step.max ?? (step.min === null && step.nominal !== null ? step.nominal * (1 + tol) : null);
			if (lo === null && hi === null) return 'no_spec' as const;
			const eps = 1e-9 * Math.max(1, Math.abs(value));
			if (lo !== null && value < lo - eps) return 'low' as const;
			if (hi !== null && value > hi + eps) return 'high' as const;
			return 'in' as const;
		}
		const symbols: Record<string, string> = {
			'N.m': 'Nm',
			'kgf.m': 'kgf m',
			'[lbf_av].[ft_i]': 'lbf ft',
			L: 'L',
			mm: 'mm',
			kPa: 'kPa',
			V: 'V',
			'/min': 'rpm'
		};
		async function log(
			j: Awaited<ReturnType<typeof makeJob>>,
			author: typeof tomasz,
			label: string,
			value: number | null,
			minutesAgo: number,
			extra: Partial<typeof s.logEntry.$inferInsert> = {}
		) {
			const step = j.steps.find((st) => st.label === label);
			if (!step) throw new Error(`demo step not found: ${label}`);
			const measured = value !== null && step.unit !== null;
			const rawText = measured
				? `${label.toLowerCase()} ${value} ${symbols[step.unit!] ?? step.unit}`
				: `done ${label.toLowerCase()}`;
			const tool = step.unit && /lbf|N\.m|kgf/.test(step.unit) ? tools[value! > 40 ? 1 : 0] : null;
			await tx.insert(s.logEntry).values({
				id: crypto.randomUUID(),
				shopId: shop.id,
				jobId: j.job.id,
				jobStepId: step.id,
				authorId: author.id,
				kind: measured ? 'measure' : 'done',
				rawText,
				source: 'typed',
				value: measured ? value : null,
				unit: measured ? step.unit : null,
				specValue: measured ? value : null,
				specUnit: measured ? step.unit : null,
				verdict: measured ? judge(step, value!) : null,
				torqueToolId: tool?.id ?? null,
				toolCalibrationOverdue: tool?.identifier === 'TW-02',
				occurredAt: ago(minutesAgo),
				recordedAt: ago(minutesAgo),
				...extra
			});
		}

		// Demo history for spec drift: 24 past paid services, one every five days, whose
		// rear axle nut was torqued with TW-02. Invented values that creep upward, so the Floor's
		// spec drift page has a chart, Cp/Cpk (n ≥ 20) and a tool leaning above nominal to show.
		for (let i = 0; i < 24; i++) {
			const past = await makeJob({
				number: 1001 + i,
				vehicle: i % 4,
				procs: [0],
				state: 'paid',
				tech: i % 2 ? ruth : tomasz,
				bay: `Bay ${(i % 4) + 1}`,
				concern: 'Routine service (demo history).',
				odometer: 4000 + i * 350,
				createdMinutesAgo: (24 - i) * 5 * 24 * 60 + 120
			});
			const value = Math.round((87 + i * 0.25 + ((i * 7) % 5) - 2) * 10) / 10;
			await log(past, i % 2 ? ruth : tomasz, 'Rear axle nut', value, (24 - i) * 5 * 24 * 60);
		}

		await makeJob({
			number: 1039,
			vehicle: 3,
			procs: [0],
			state: 'paid',
			tech: ruth,
			bay: 'Bay 3',
			concern: 'Fleet service due at 6 000 km.',
			odometer: 6120,
			createdMinutesAgo: 60 * 24 * 9
		});
		await makeJob({
			number: 1041,
			vehicle: 0,
			procs: [0],
			state: 'open',
			tech: tomasz,
			bay: 'Bay 1',
			concern: 'Service due; chain noisy at low speed.',
			odometer: 11840,
			createdMinutesAgo: 50
		});

		const engine = await makeJob({
			number: 1042,
			vehicle: 1,
			procs: [1],
			state: 'in_work',
			tech: tomasz,
			bay: 'Bay 2',
			concern: 'Engine out for crankcase gasket; refit and adjust.',
			odometer: 23410,
			createdMinutesAgo: 60 * 5
		});
		await log(engine, tomasz, 'Disconnect battery', null, 240);
		await log(engine, tomasz, 'Drain fuel and close the tap', null, 236);
		await log(engine, tomasz, 'Support engine on jack', null, 95);
		await log(engine, tomasz, 'Upper engine mount bolt', 5.1, 70);
		await log(engine, tomasz, 'Front engine mount bolts', 3.7, 64);
		await log(engine, tomasz, 'Lower engine mount bolt', 56, 58);

		const chain = await makeJob({
			number: 1043,
			vehicle: 2,
			procs: [2],
			state: 'in_work',
			tech: ruth,
			bay: 'Bay 3',
			concern: 'Chain and sprockets worn: renew.',
			odometer: 15230,
			createdMinutesAgo: 90
		});
		await log(chain, ruth, 'New drive chain fitted', null, 40, {
			kind: 'part',
			partId: partId('CH-428-118'),
			partQuantity: 1
		});
		await log(chain, ruth, 'Front sprocket nut', 66, 33);
		await log(chain, ruth, 'Rear sprocket nuts', 27, 25);

		const inspect = await makeJob({
			number: 1044,
			vehicle: 3,
			procs: [0],
			state: 'final_inspection',
			tech: ruth,
			bay: 'Bay 4',
			concern: 'Fleet service due at 12 000 km.',
			odometer: 12090,
			createdMinutesAgo: 60 * 4
		});
		const service: [string, number | null][] = [
			['Engine oil drain plug', 24],
			['Oil filter cover bolts', 10],
			['Engine oil fill', 1.1],
			['Spark plug', 1.3],
			['Valve clearance intake', 0.1],
			['Valve clearance exhaust', 0.18],
			['Throttle grip free play', 4],
			['Clutch lever free play', 14],
			['Drive chain slack', 30],
			['Rear axle nut', 90],
			['Front tyre pressure', 200],
			['Rear tyre pressure', 225],
			['Battery voltage', 12.8],
			['Idle speed', 1420],
			['Test ride', null]
		];
		for (const [i, [label, value]] of service.entries()) {
			await log(inspect, ruth, label, value, 200 - i * 8);
		}

		await makeJob({
			number: 1045,
			vehicle: 0,
			procs: [2],
			state: 'on_hold',
			tech: null,
			bay: null,
			concern: 'Chain kit ordered.',
			odometer: 11840,
			createdMinutesAgo: 60 * 26,
			reason: 'Waiting for parts: chain kit'
		});

		// Invoicing demo: signed off and ready to invoice, with a full log. The oil was called
		// out in US quarts against a per-litre oil (billed as 1.041 L), the chain lube was logged
		// as a part by its words only, one wrong value was retracted, and the foreman accepted an
		// idle speed just over spec with a reason.
		const foreman = byRole('foreman');
		const billable = await makeJob({
			number: 1046,
			vehicle: 2,
			procs: [0],
			state: 'ready_to_invoice',
			tech: tomasz,
			bay: null,
			concern: 'Service due at 18 000 km; chain dry.',
			odometer: 18020,
			createdMinutesAgo: 60 * 7
		});
		const at = (m: number) => ({ occurredAt: ago(m), recordedAt: ago(m) });
		await log(billable, tomasz, 'Engine oil drain plug', 42, 330);
		const wrongPlug = (
			await tx
				.select({ id: s.logEntry.id })
				.from(s.logEntry)
				.where(eq(s.logEntry.jobId, billable.job.id))
		)[0].id;
		const plugStep = billable.steps.find((st) => st.label === 'Engine oil drain plug')!;
		await tx.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: shop.id,
			jobId: billable.job.id,
			jobStepId: plugStep.id,
			authorId: tomasz.id,
			kind: 'retraction',
			rawText: 'scratch that, misread the scale',
			source: 'voice',
			retracts: wrongPlug,
			...at(328)
		});
		await log(billable, tomasz, 'Engine oil drain plug', 24, 327);
		await log(billable, tomasz, 'Oil filter cover bolts', 10, 318);
		await log(billable, tomasz, 'Engine oil fill', 1.1, 310, {
			rawText: 'oil fill one point one quarts',
			source: 'voice',
			unit: '[qt_us]',
			specValue: 1.041,
			specUnit: 'L',
			verdict: 'in'
		});
		await log(billable, tomasz, 'Spark plug', 1.3, 300);
		await log(billable, tomasz, 'Valve clearance intake', 0.1, 285);
		await log(billable, tomasz, 'Valve clearance exhaust', 0.19, 276);
		await log(billable, tomasz, 'Throttle grip free play', 4, 268);
		await log(billable, tomasz, 'Clutch lever free play', 13, 262);
		await log(billable, tomasz, 'Drive chain slack', 28, 255);
		await tx.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: shop.id,
			jobId: billable.job.id,
			authorId: tomasz.id,
			kind: 'part',
			rawText: 'used chain lube spray on the chain',
			source: 'voice',
			partQuantity: 1,
			...at(253)
		});
		await log(billable, tomasz, 'Rear axle nut', 88, 250);
		await log(billable, tomasz, 'Front tyre pressure', 200, 246);
		await log(billable, tomasz, 'Rear tyre pressure', 225, 244);
		await log(billable, tomasz, 'Battery voltage', 12.7, 240);
		await log(billable, tomasz, 'Idle speed', 1540, 236);
		const idle = billable.steps.find((st) => st.label === 'Idle speed')!;
		const [idleEntry] = await tx
			.select({ id: s.logEntry.id })
			.from(s.logEntry)
			.where(and(eq(s.logEntry.jobId, billable.job.id), eq(s.logEntry.jobStepId, idle.id)));
		await tx.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: shop.id,
			jobId: billable.job.id,
			jobStepId: idle.id,
			authorId: foreman.id,
			kind: 'accept',
			rawText: 'accept idle 1540',
			source: 'typed',
			note: 'Idle settles to 1480 once warm; within the usual drift. Customer told.',
			respondsTo: idleEntry.id,
			...at(200)
		});
		await log(billable, tomasz, 'Test ride', null, 228);
		await tx.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: shop.id,
			jobId: billable.job.id,
			authorId: foreman.id,
			kind: 'sign_off',
			rawText: 'signed off',
			source: 'typed',
			...at(190)
		});
		await tx
			.update(s.job)
			.set({ signedOffBy: foreman.id, signedOffAt: ago(190) })
			.where(eq(s.job.id, billable.job.id));
		for (const c of closeAtEnd) {
			await tx.update(s.job).set({ state: c.state }).where(eq(s.job.id, c.id));
		}
	});

	// A second shop, so that shop scoping is visible in the demo and testable.
	const [other] = await db
		.insert(s.shop)
		.values({
			name: otherShopName,
			currency: 'EUR',
			labourRateMinor: 6500,
			taxRateBp: 2000,
			bays: ['Bay A'],
			timeZone: serverTimeZone
		})
		.returning();
	await db
		.insert(s.user)
		.values(otherAccounts.map((a) => ({ ...a, shopId: other.id, passwordHash })));
	const [oc] = await db
		.insert(s.customer)
		.values({ shopId: other.id, name: 'Rosa Quintero-Nakamura', email: 'rosa@example.test' })
		.returning();
	const [ov] = await db
		.insert(s.vehicle)
		.values({
			shopId: other.id,
			customerId: oc.id,
			registration: 'HL 20 SCT',
			make: 'Quillon',
			model: 'Pico 50 scooter',
			year: 2020
		})
		.returning();
	await db.insert(s.job).values({
		shopId: other.id,
		number: 501,
		customerId: oc.id,
		vehicleId: ov.id,
		concern: 'Brakes squeal.',
		state: 'open'
	});

	console.log(`  Demo shop "${demoShopName}" seeded (plus "${otherShopName}").`);
}

try {
	await main();
} finally {
	await client.end();
}
