import { driftWindow } from '$lib/floor/drift-window';
import { driftQuerySchema } from '$lib/schemas/floor';
import { calibrationDue } from '$lib/torque';
import { capabilityOf, sideBiasOf } from '$lib/stats';
import { requireRole } from '$lib/server/auth';
import { driftForStep, driftForTool, driftOptions } from '$lib/server/drift';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url, parent }) => {
	const user = requireRole('foreman', 'owner');
	const now = new Date();
	// The window's days are the shop's days: midnight to midnight in its time zone.
	const [{ shopStyle }, options] = await Promise.all([parent(), driftOptions(user.shopId, now)]);
	const zone = shopStyle.timeZone;
	const parsed = driftQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	const query = parsed.success ? parsed.data : {};
	let problem = parsed.success ? null : 'That step or tool is not one of this shop’s.';
	const asked = driftWindow({ from: query.from, to: query.to }, now, zone);
	// A window that cannot be read says why and shows the default one meanwhile.
	if (!asked.ok) problem = `${asked.message} Showing the default window.`;
	const window = asked.ok ? asked : driftWindow({}, now, zone);
	if (!window.ok) throw new Error('the default drift window is always valid');
	const windowInput = { from: query.from ?? '', to: query.to ?? '' };

	// Every tool is checked for bias (over its default window) and calibration, so the page can
	// call out any of them.
	const defaultWindow = window.custom ? driftWindow({}, now, zone) : window;
	if (!defaultWindow.ok) throw new Error('the default drift window is always valid');
	const toolChecks = await Promise.all(
		options.tools.map(async (t) => {
			const d = await driftForTool(user.shopId, t.id, defaultWindow);
			const calibration = d?.tool.calibratedOn
				? calibrationDue(d.tool.calibratedOn, { months: d.tool.intervalMonths })
				: null;
			const counts = d
				? { ...d.stats, n: d.stats.nNominal }
				: { n: 0, above: 0, below: 0, meanDeviationPct: null };
			return { ...t, bias: sideBiasOf(counts), calibration };
		})
	);

	if (query.tool) {
		const d = await driftForTool(user.shopId, query.tool, window);
		if (d) {
			return {
				options,
				toolChecks,
				problem,
				windowInput,
				view: 'tool' as const,
				tool: d,
				check: toolChecks.find((t) => t.id === d.tool.id) ?? null,
				bias: sideBiasOf({ ...d.stats, n: d.stats.nNominal })
			};
		}
	}
	const stepId = query.step || options.steps.find((s) => s.n > 0)?.id || options.steps[0]?.id;
	const d = stepId ? await driftForStep(user.shopId, stepId, window) : null;
	return {
		options,
		toolChecks,
		problem: problem ?? (query.tool ? 'That tool is not one of this shop’s.' : null),
		windowInput,
		view: 'step' as const,
		step: d,
		stats: d
			? capabilityOf(d.stats.n, d.stats.mean, d.stats.s, { lsl: d.step.lsl, usl: d.step.usl })
			: null
	};
};
