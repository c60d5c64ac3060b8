import { driftQuerySchema } from '$lib/schemas/floor';
import { calibrationDue } from '$lib/torque';
import { capability, sideBias } from '$lib/stats';
import { requireRole } from '$lib/server/auth';
import { driftForStep, driftForTool, driftOptions } from '$lib/server/floor';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const user = requireRole('foreman', 'owner');
	const options = await driftOptions(user.shopId);
	const parsed = driftQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	const query = parsed.success ? parsed.data : {};
	const problem = parsed.success ? null : 'That step or tool is not one of this shop’s.';

	// Every tool is checked for bias and calibration, so the page can call out any of them.
	const toolChecks = await Promise.all(
		options.tools.map(async (t) => {
			const d = await driftForTool(user.shopId, t.id);
			const calibration = d?.tool.calibratedOn
				? calibrationDue(d.tool.calibratedOn, { months: d.tool.intervalMonths })
				: null;
			return { ...t, bias: sideBias(d?.readings ?? []), calibration };
		})
	);

	if (query.tool) {
		const d = await driftForTool(user.shopId, query.tool);
		if (d) {
			return {
				options,
				toolChecks,
				problem,
				view: 'tool' as const,
				tool: d,
				check: toolChecks.find((t) => t.id === d.tool.id) ?? null
			};
		}
	}
	const stepId = query.step || options.steps.find((s) => s.n > 0)?.id || options.steps[0]?.id;
	const d = stepId ? await driftForStep(user.shopId, stepId) : null;
	return {
		options,
		toolChecks,
		problem: problem ?? (query.tool ? 'That tool is not one of this shop’s.' : null),
		view: 'step' as const,
		step: d,
		stats: d
			? capability(
					d.points.map((p) => p.value),
					{ lsl: d.step.lsl, usl: d.step.usl }
				)
			: null
	};
};
