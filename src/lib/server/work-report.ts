// The work report of a job: every step with what was logged on it, who and when; retractions
// and the foreman's decisions shown, never hidden. Scoped by shop id.
import { and, asc, eq } from 'drizzle-orm';
import { entryKindWords, specText, verdictWords } from '$lib/invoice/report';
import { formatQuantity } from '$lib/units';
import { db } from './db';
import { job, jobProcedure, jobStep, logEntry, user } from './db/schema';
import { retractedIds } from '$lib/log/live';

export interface ReportEntry {
	id: string;
	kind: string;
	what: string;
	value: string | null;
	verdict: string | null;
	by: string;
	at: Date;
	retracted: boolean;
	note: string | null;
}

const gradeWords: Record<string, string> = {
	meets: 'grade meets spec',
	fails: 'wrong grade',
	not_stated: 'grade not stated'
};

/** The logged value with the fluid grade and its verdict: "1.1 L · SAE 10W-40 · JASO MA2 (grade meets spec)". */
function withGrade(
	value: string | null,
	fluid: string | null,
	verdict: string | null
): string | null {
	if (!verdict) return value;
	const grade = `${fluid ?? ''} (${gradeWords[verdict] ?? verdict})`.trim();
	return value ? `${value} · ${grade}` : grade;
}

export interface ReportStep {
	label: string;
	spec: string;
	entries: ReportEntry[];
}

export interface WorkReport {
	procedures: { name: string; steps: ReportStep[] }[];
	/** Entries on no step: notes, parts, final-inspection ticks, sign-off. */
	general: ReportEntry[];
	signedOffBy: string | null;
	signedOffAt: Date | null;
}

export async function workReport(shopId: string, jobId: string): Promise<WorkReport> {
	const [j] = await db
		.select({ signedOffAt: job.signedOffAt, signedOffBy: user.name })
		.from(job)
		.leftJoin(user, eq(user.id, job.signedOffBy))
		.where(and(eq(job.shopId, shopId), eq(job.id, jobId)));
	const procs = await db
		.select()
		.from(jobProcedure)
		.where(and(eq(jobProcedure.shopId, shopId), eq(jobProcedure.jobId, jobId)))
		.orderBy(asc(jobProcedure.position));
	const steps = await db
		.select()
		.from(jobStep)
		.where(and(eq(jobStep.shopId, shopId), eq(jobStep.jobId, jobId)))
		.orderBy(asc(jobStep.position));
	const entries = await db
		.select({ e: logEntry, author: user.name })
		.from(logEntry)
		.leftJoin(user, eq(user.id, logEntry.authorId))
		.where(and(eq(logEntry.shopId, shopId), eq(logEntry.jobId, jobId)))
		.orderBy(asc(logEntry.seq));

	const retracted = retractedIds(entries.map((r) => r.e));
	const byId = new Map(entries.map((r) => [r.e.id, r.e]));
	const stepOf = (id: string | null): string | null => {
		if (!id) return null;
		const e = byId.get(id);
		if (!e) return null;
		return e.jobStepId ?? stepOf(e.retracts ?? e.respondsTo);
	};
	const toEntry = (r: (typeof entries)[number]): ReportEntry => {
		const e = r.e;
		let what = entryKindWords[e.kind] ?? e.kind;
		if (e.kind === 'retraction' || e.kind === 'accept' || e.kind === 'redo') {
			const target = e.retracts ?? e.respondsTo;
			const t = target ? byId.get(target) : undefined;
			if (t) what += `: “${t.rawText}”`;
		}
		return {
			id: e.id,
			kind: e.kind,
			what,
			// As called out, and in the spec's unit when that differs (1.1 qt = 1.04 L).
			value: withGrade(
				e.value !== null && e.unit
					? formatQuantity(e.value, e.unit) +
							(e.specValue !== null && e.specUnit && e.specUnit !== e.unit
								? ` = ${formatQuantity(e.specValue, e.specUnit)}`
								: '')
					: null,
				e.fluid,
				e.fluidVerdict
			),
			verdict: e.verdict ? verdictWords[e.verdict] : null,
			by: r.author ?? 'unknown',
			at: e.occurredAt,
			retracted: retracted.has(e.id),
			note: e.note ?? (e.kind === 'note' || e.kind === 'part' ? e.rawText : null)
		};
	};
	const onStep = new Map<string, ReportEntry[]>();
	const general: ReportEntry[] = [];
	for (const r of entries) {
		const sid = r.e.jobStepId ?? stepOf(r.e.retracts ?? r.e.respondsTo);
		if (sid) onStep.set(sid, [...(onStep.get(sid) ?? []), toEntry(r)]);
		else general.push(toEntry(r));
	}
	return {
		procedures: procs.map((p) => ({
			name: p.name,
			steps: steps
				.filter((s) => s.jobProcedureId === p.id)
				.map((s) => ({
					label: s.label,
					spec: specText(s) + (s.fluid ? ` · ${s.fluid}` : ''),
					entries: onStep.get(s.id) ?? []
				}))
		})),
		general,
		signedOffBy: j?.signedOffBy ?? null,
		signedOffAt: j?.signedOffAt ?? null
	};
}
