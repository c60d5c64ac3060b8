import { requireRole } from '$lib/server/auth';
import { benchJobs, getJob, findJobIdByNumber, mayWrite } from '$lib/server/bench/job';
import { listSteps } from '$lib/server/bench/steps';
import { listTools, shopTolerance } from '$lib/server/bench/tools';
import { listEntries } from '$lib/server/log/read';
import { listOpenRedos } from '$lib/server/floor/queue';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('technician', 'foreman', 'owner');
	const jobs = await benchJobs(user);
	const asked = url.searchParams.get('job');
	const number = asked && /^\d{1,9}$/.test(asked) ? Number(asked) : null;
	let notice: string | null = null;
	let job = number !== null ? (jobs.find((j) => j.number === number) ?? null) : null;
	if (number !== null && !job) {
		// A foreman may open any job of the shop; a technician only their own.
		const id = await findJobIdByNumber(user.shopId, number);
		const found = id ? await getJob(user.shopId, id) : null;
		if (found && mayWrite(user, found)) job = found;
		else notice = `Job ${number} is not on your bench.`;
	}
	job ??= jobs.find((j) => j.state === 'in_work') ?? jobs[0] ?? null;
	const [steps, log, tools, { pct }, redos] = await Promise.all([
		job ? listSteps(user.shopId, job.id) : [],
		job ? listEntries(user.shopId, job.id, { limit: 50 }) : { entries: [], nextBefore: null },
		listTools(user.shopId),
		shopTolerance(user.shopId),
		job ? listOpenRedos(user.shopId, job.id) : []
	]);
	return {
		me: { id: user.id, name: user.name, role: user.role },
		jobs,
		job,
		steps,
		entries: log.entries,
		nextBefore: log.nextBefore,
		tools,
		tolerancePct: pct,
		notice,
		redos
	};
};
