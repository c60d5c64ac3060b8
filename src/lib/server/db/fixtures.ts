// Test fixtures for DB integration tests: a fresh shop each call, so tests never depend on
// each other or on the demo data. Only *.db.test.ts files import this.
import postgres, { type Sql } from 'postgres';
import { db } from './index';
import * as s from './schema';
import type { AppendResult } from '../log/append';

/**
 * A shop with an owner, a technician, a customer, a vehicle and one job in work with one step.
 * `jobOpenedAt` dates the job card: a test that appends at a fixed `now` opens the job before
 * it (entries may be dated at most a day before the job's opening).
 */
export async function makeShop(name: string, opts: { jobOpenedAt?: Date } = {}) {
	const tag = crypto.randomUUID().slice(0, 8);
	const [shop] = await db
		.insert(s.shop)
		.values({ name: `${name} ${tag}` })
		.returning();
	const users = await db
		.insert(s.user)
		.values([
			{
				shopId: shop.id,
				email: `owner-${tag}@test.test`,
				name: 'Owner',
				role: 'owner',
				passwordHash: 'x'
			},
			{
				shopId: shop.id,
				email: `tech-${tag}@test.test`,
				name: 'Tech',
				role: 'technician',
				passwordHash: 'x'
			}
		])
		.returning();
	const [customer] = await db
		.insert(s.customer)
		.values({ shopId: shop.id, name: `Customer ${tag}` })
		.returning();
	const [vehicle] = await db
		.insert(s.vehicle)
		.values({
			shopId: shop.id,
			customerId: customer.id,
			registration: `T ${tag}`,
			make: 'Testmake',
			model: 'One'
		})
		.returning();
	const [procedure] = await db
		.insert(s.procedure)
		.values({ shopId: shop.id, name: `Procedure ${tag}` })
		.returning();
	const [job] = await db
		.insert(s.job)
		.values({
			shopId: shop.id,
			number: 1,
			customerId: customer.id,
			vehicleId: vehicle.id,
			technicianId: users[1].id,
			state: 'in_work',
			...(opts.jobOpenedAt ? { createdAt: opts.jobOpenedAt } : {})
		})
		.returning();
	const [jobProcedure] = await db
		.insert(s.jobProcedure)
		.values({
			shopId: shop.id,
			jobId: job.id,
			procedureId: procedure.id,
			name: procedure.name,
			position: 1
		})
		.returning();
	const [step] = await db
		.insert(s.jobStep)
		.values({
			shopId: shop.id,
			jobId: job.id,
			jobProcedureId: jobProcedure.id,
			position: 1,
			label: 'Rear axle nut',
			unit: 'N.m',
			min: 80,
			max: 96
		})
		.returning();
	return { shop, owner: users[0], tech: users[1], customer, vehicle, job, step };
}

export async function logMeasurement(
	f: Awaited<ReturnType<typeof makeShop>>,
	value: number,
	verdict: 'in' | 'low' | 'high'
) {
	const [row] = await db
		.insert(s.logEntry)
		.values({
			id: crypto.randomUUID(),
			shopId: f.shop.id,
			jobId: f.job.id,
			jobStepId: f.step.id,
			authorId: f.tech.id,
			kind: 'measure',
			rawText: `rear axle ${value} nm`,
			source: 'typed',
			value,
			unit: 'N.m',
			specValue: value,
			specUnit: 'N.m',
			verdict,
			occurredAt: new Date()
		})
		.returning();
	return row;
}

/** A torque tool of the shop: an invented demo click wrench, 40–200 N·m, 300 mm to its mark. */
export async function addTorqueTool(
	f: Awaited<ReturnType<typeof makeShop>>,
	over: Partial<typeof s.torqueTool.$inferInsert> = {}
) {
	const [tool] = await db
		.insert(s.torqueTool)
		.values({
			shopId: f.shop.id,
			identifier: 'TW-1 (demo)',
			kind: 'Type II class A click',
			rangeMin: 40,
			rangeMax: 200,
			unit: 'N.m',
			calibratedOn: '2026-06-01',
			effectiveLengthMm: 300,
			...over
		})
		.returning();
	return tool;
}

/** The entry an append stored, or the test fails with what it answered instead. */
export function entryOf(r: AppendResult) {
	if (!('entry' in r)) throw new Error(`expected an entry, got ${JSON.stringify(r)}`);
	return r.entry;
}

/** Runs `work` on a database of its own, created empty and dropped afterwards (for migrations). */
export async function withScratchDatabase<T>(work: (sql: Sql) => Promise<T>): Promise<T> {
	const url = process.env.DATABASE_URL!;
	const admin = postgres(url, { max: 1, onnotice: () => {} });
	const name = `benchcall_scratch_${process.pid}_${Date.now()}_${crypto.randomUUID().slice(0, 8)}`;
	await admin.unsafe(`create database ${name}`);
	const u = new URL(url);
	u.pathname = `/${name}`;
	const sql = postgres(u.toString(), { max: 1, onnotice: () => {} });
	try {
		return await work(sql);
	} finally {
		await sql.end();
		await admin.unsafe(`drop database if exists ${name} with (force)`);
		await admin.end();
	}
}
