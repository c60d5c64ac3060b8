import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { logMeasurement, makeShop } from './db/fixtures';
import * as s from './db/schema';
import {
	getCustomer,
	getVehicle,
	searchVehicles,
	sendDueReminder,
	stepSeries,
	vehicleDue,
	vehiclesDueWithin
} from './vehicles';

/** The fixture's procedure due every 6,000 km or 12 months, last done at 10,000 km on `on`. */
async function lastServiced(f: Awaited<ReturnType<typeof makeShop>>, on: Date) {
	const [proc] = await db.select().from(s.procedure).where(eq(s.procedure.shopId, f.shop.id));
	await db
		.update(s.procedure)
		.set({ intervalKm: 6000, intervalMonths: 12 })
		.where(eq(s.procedure.id, proc.id));
	await db.update(s.job).set({ odometer: 10_000, createdAt: on }).where(eq(s.job.id, f.job.id));
}

describe('vehicles', () => {
	it('finds a registration typed with other spaces and case, a phone or a name', async () => {
		const f = await makeShop('Vehicles');
		await db
			.update(s.customer)
			.set({ phone: '+44 (0)20 7946 0321' })
			.where(eq(s.customer.id, f.customer.id));
		// The fixture's registration is "T <tag>": typed lower case, without the space.
		const typed = f.vehicle.registration.replace(' ', '').toLowerCase();
		expect((await searchVehicles(f.shop.id, typed)).map((v) => v.id)).toEqual([f.vehicle.id]);
		expect(
			(await searchVehicles(f.shop.id, ` ${typed.slice(0, 3)} ${typed.slice(3)} `)).map((v) => v.id)
		).toEqual([f.vehicle.id]);
		expect((await searchVehicles(f.shop.id, '7946 0321')).map((v) => v.id)).toEqual([f.vehicle.id]);
		expect(
			(await searchVehicles(f.shop.id, f.customer.name.toUpperCase())).map((v) => v.id)
		).toEqual([f.vehicle.id]);
		expect(await searchVehicles(f.shop.id, 'no such thing %_')).toEqual([]);
	});

	it('never shows another shop’s vehicle or customer', async () => {
		const f = await makeShop('Vehicles');
		const other = await makeShop('Vehicles other');
		expect(await getVehicle(other.shop.id, f.vehicle.id)).toBeNull();
		expect(await getCustomer(other.shop.id, f.customer.id)).toBeNull();
		expect(await searchVehicles(other.shop.id, f.vehicle.registration)).toEqual([]);
	});

	it('shows each step’s values across jobs, without retracted ones', async () => {
		const f = await makeShop('Vehicles');
		await logMeasurement(f, 84, 'in');
		const wrong = await logMeasurement(f, 8.4, 'low');
		await db.insert(s.logEntry).values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: f.job.id,
			authorId: f.tech.id,
			kind: 'retraction',
			rawText: 'undo',
			source: 'typed',
			retracts: wrong.id,
			occurredAt: new Date()
		});
		await logMeasurement(f, 97, 'high');
		const series = await stepSeries(f.shop.id, f.vehicle.id);
		expect(series).toHaveLength(1);
		expect(series[0]).toMatchObject({ label: 'Rear axle nut', unit: 'N.m' });
		expect(series[0].points.map((p) => p.value)).toEqual([84, 97]);
	});

	it('says what is due from the last job with an interval procedure, and e-mails the customer', async () => {
		const f = await makeShop('Vehicles');
		await lastServiced(f, new Date('2025-12-20T09:00:00Z'));
		const today = new Date('2026-12-04T09:00:00Z');
		const due = await vehicleDue(f.shop.id, f.vehicle.id, today);
		expect(due).toHaveLength(1);
		expect(due[0]).toMatchObject({ state: 'due_soon', dueAtOdometer: 16_000, lastJobNumber: 1 });
		const listed = await vehiclesDueWithin(f.shop.id, 30, today);
		expect(listed.map((d) => d.vehicle.id)).toEqual([f.vehicle.id]);

		const sent = await sendDueReminder(
			f.shop.id,
			f.vehicle.id,
			'rider@example.test',
			f.owner.id,
			'Demo shop',
			today
		);
		const [mail] = await db.select().from(s.mailOutbox).where(eq(s.mailOutbox.shopId, f.shop.id));
		expect(mail.toAddress).toBe('rider@example.test');
		expect(mail.raw).toContain('16,000 km');
		expect(sent.ok).toBe(mail.status === 'sent');
	});

	it("writes the reminder's dates and numbers in the shop's locale and on its calendar", async () => {
		const f = await makeShop('Vehicles');
		await db
			.update(s.shop)
			.set({ locale: 'de-DE', timeZone: 'Europe/Berlin' })
			.where(eq(s.shop.id, f.shop.id));
		// 23:30 UTC on 20 December is already 21 December in Berlin (CET, UTC+1 in winter: IANA
		// time zone database); due twelve months later, on the shop's calendar
		await lastServiced(f, new Date('2025-12-20T23:30:00Z'));
		await sendDueReminder(
			f.shop.id,
			f.vehicle.id,
			'rider@example.test',
			f.owner.id,
			'Demo shop',
			new Date('2026-12-04T09:00:00Z')
		);
		const [mail] = await db.select().from(s.mailOutbox).where(eq(s.mailOutbox.shopId, f.shop.id));
		// German conventions (Unicode CLDR, locale de): "." groups thousands, dates read dd.MM.y
		expect(mail.raw).toContain('16.000 km');
		expect(mail.raw).toContain('21.12.2026');
		expect(mail.raw).not.toContain('20.12.2026');
	});
});
