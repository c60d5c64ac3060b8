// A torque tool's checks against a tester (ISO 6789), its standing, and the work done with it
// since its last good check when a check fails. Scoped by shop id.
import { and, desc, eq, sql } from 'drizzle-orm';
import { judgeCheck, permissiblePct, testPoints, type CheckResult } from '$lib/torque/iso6789';
import { calibrationDue } from '$lib/torque';
import { failure, type Result } from '$lib/result';
import { db } from './db';
import * as s from './db/schema';
import { isLive } from './log/live';

export interface ToolCheckView {
	id: string;
	checkedOn: string;
	checkedBy: string;
	tester: string;
	points: s.CheckPoint[];
	unit: string;
	permissiblePct: number;
	worstPct: number;
	passed: boolean;
	note: string | null;
	recordedBy: string;
}

export interface ToolStanding {
	/** ISO 6789's permissible deviation for the tool's type and class; null: the owner states it. */
	standardPct: number | null;
	points: number[];
	dueDate: string | null;
	/** 'failed': the last check failed; 'overdue': past due or never calibrated. */
	state: 'ok' | 'due_soon' | 'overdue' | 'failed';
}

export interface RevisitJob {
	jobId: string;
	number: number;
	registration: string | null;
	entries: number;
	outOfSpecNow: number;
	first: string;
	last: string;
}

/** The tool's state from its calibration date, interval and last check. */
export function standing(
	tool: s.TorqueTool,
	lastCheck: { passed: boolean } | null,
	shopMonths: number,
	today = new Date()
): ToolStanding {
	const base = {
		standardPct: permissiblePct(tool.kind, tool.rangeMax, tool.unit),
		points: testPoints(tool.rangeMin, tool.rangeMax)
	};
	let dueDate: string | null = null;
	let state: ToolStanding['state'] = 'overdue';
	if (tool.calibratedOn) {
		try {
			const st = calibrationDue(tool.calibratedOn, {
				months: tool.intervalMonths ?? shopMonths,
				today
			});
			dueDate = st.dueDate;
			state = st.state;
		} catch {
			state = 'overdue';
		}
	}
	if (lastCheck && !lastCheck.passed) state = 'failed';
	return { ...base, dueDate, state };
}

/** The newest check of each of the shop's tools (for the Bench and the tool lists). */
export async function lastChecks(
	shopId: string
): Promise<Map<string, { checkedOn: string; passed: boolean }>> {
	const rows = await db
		.selectDistinctOn([s.torqueToolCheck.torqueToolId], {
			toolId: s.torqueToolCheck.torqueToolId,
			checkedOn: s.torqueToolCheck.checkedOn,
			passed: s.torqueToolCheck.passed
		})
		.from(s.torqueToolCheck)
		.where(eq(s.torqueToolCheck.shopId, shopId))
		.orderBy(
			s.torqueToolCheck.torqueToolId,
			desc(s.torqueToolCheck.checkedOn),
			desc(s.torqueToolCheck.createdAt)
		);
	return new Map(rows.map((r) => [r.toolId, { checkedOn: r.checkedOn, passed: r.passed }]));
}

/** One tool of the shop with its checks, newest first; null when the shop has no such tool. */
export async function toolWithChecks(shopId: string, toolId: string, today = new Date()) {
	const [tool] = await db
		.select()
		.from(s.torqueTool)
		.where(and(eq(s.torqueTool.shopId, shopId), eq(s.torqueTool.id, toolId)));
	if (!tool) return null;
	const [shop] = await db
		.select({ months: s.shop.calibrationMonths })
		.from(s.shop)
		.where(eq(s.shop.id, shopId));
	const checks: ToolCheckView[] = await db
		.select({
			id: s.torqueToolCheck.id,
			checkedOn: s.torqueToolCheck.checkedOn,
			checkedBy: s.torqueToolCheck.checkedBy,
			tester: s.torqueToolCheck.tester,
			points: s.torqueToolCheck.points,
			unit: s.torqueToolCheck.unit,
			permissiblePct: s.torqueToolCheck.permissiblePct,
			worstPct: s.torqueToolCheck.worstPct,
			passed: s.torqueToolCheck.passed,
			note: s.torqueToolCheck.note,
			recordedBy: s.user.name
		})
		.from(s.torqueToolCheck)
		.innerJoin(s.user, eq(s.user.id, s.torqueToolCheck.recordedBy))
		.where(and(eq(s.torqueToolCheck.shopId, shopId), eq(s.torqueToolCheck.torqueToolId, toolId)))
		.orderBy(desc(s.torqueToolCheck.checkedOn), desc(s.torqueToolCheck.createdAt));
	const last = checks[0] ?? null;
	return {
		tool,
		checks,
		standing: standing(tool, last, shop?.months ?? 12, today),
		revisit: last && !last.passed ? await jobsToRevisit(shopId, toolId, checks) : []
	};
}

export interface CheckInput {
	checkedOn: string;
	checkedBy: string;
	tester: string;
	points: s.CheckPoint[];
	/** Only used when the tool's type and class give no permissible deviation. */
	permissiblePct: number | null;
	note: string | null;
}

export type RecordResult = Result<{ result: CheckResult; permissiblePct: number }>;

/**
 * Records a check. A passed check renews the tool's calibration date (when it is newer); a
 * failed one marks the tool until a later check passes. The tool's row is locked meanwhile,
 * so two checks recorded at once both land, one after the other.
 */
export function recordCheck(
	shopId: string,
	userId: string,
	toolId: string,
	input: CheckInput
): Promise<RecordResult> {
	return db.transaction(async (tx) => {
		const [tool] = await tx
			.select()
			.from(s.torqueTool)
			.where(and(eq(s.torqueTool.shopId, shopId), eq(s.torqueTool.id, toolId)))
			.for('update');
		if (!tool) return failure('not_found', 'No such torque tool in this shop.');
		const pct = permissiblePct(tool.kind, tool.rangeMax, tool.unit) ?? input.permissiblePct;
		if (pct === null) {
			return failure(
				'invalid',
				`Benchcall cannot read a permissible deviation from “${tool.kind}”: give the one on the tool’s certificate.`,
				'permissiblePct'
			);
		}
		const result = judgeCheck(input.points, pct);
		if (result.problems.length) {
			return failure('invalid', result.problems[0], 'points');
		}
		await tx.insert(s.torqueToolCheck).values({
			shopId,
			torqueToolId: toolId,
			checkedOn: input.checkedOn,
			checkedBy: input.checkedBy,
			tester: input.tester,
			points: input.points,
			unit: tool.unit,
			permissiblePct: pct,
			worstPct: result.worstPct,
			passed: result.passed,
			note: input.note,
			recordedBy: userId
		});
		if (result.passed && (!tool.calibratedOn || tool.calibratedOn < input.checkedOn)) {
			await tx
				.update(s.torqueTool)
				.set({ calibratedOn: input.checkedOn })
				.where(and(eq(s.torqueTool.shopId, shopId), eq(s.torqueTool.id, toolId)));
		}
		return { ok: true, result, permissiblePct: pct };
	});
}

/**
 * The jobs whose torque entries were made with this tool since its last passed check (from
 * the start of that day; from the beginning when it never passed one), grouped by job:
 * the work the foreman should look at again. Retracted entries do not count.
 */
export async function jobsToRevisit(
	shopId: string,
	toolId: string,
	checks: Pick<ToolCheckView, 'checkedOn' | 'passed'>[]
): Promise<RevisitJob[]> {
	const lastPass = checks.find((c) => c.passed)?.checkedOn ?? null;
	const rows = await db.execute(sql`
		select e.job_id, j.number, v.registration, count(*)::int as entries,
			count(*) filter (where e.verdict in ('low', 'high'))::int as out_of_spec,
			min(e.occurred_at) as first, max(e.occurred_at) as last
		from log_entry e
		join job j on j.id = e.job_id and j.shop_id = e.shop_id
		left join vehicle v on v.id = j.vehicle_id and v.shop_id = j.shop_id
		where e.shop_id = ${shopId} and e.torque_tool_id = ${toolId} and e.kind = 'measure'
			and (${lastPass}::date is null or e.occurred_at >= ${lastPass}::date)
			and ${isLive('e')}
		group by e.job_id, j.number, v.registration
		order by max(e.occurred_at) desc
		limit 200`);
	return rows.map((r) => ({
		jobId: String(r.job_id),
		number: Number(r.number),
		registration: r.registration === null ? null : String(r.registration),
		entries: Number(r.entries),
		outOfSpecNow: Number(r.out_of_spec),
		first: new Date(String(r.first)).toISOString(),
		last: new Date(String(r.last)).toISOString()
	}));
}
