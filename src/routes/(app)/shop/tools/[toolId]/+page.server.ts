import { error } from '@sveltejs/kit';
import { isUuid } from '$lib/ids';
import { requireRole } from '$lib/server/auth';
import { orError, refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import { recordCheck, toolWithChecks } from '$lib/server/tool-checks';
import { echoValues } from '$lib/schemas/form';
import { checkFormInput, toolCheckSchema } from '$lib/schemas/tool-check';
import type { Actions, PageServerLoad } from './$types';

// The owner keeps the tool records; the foreman checks tools on the shop's tester and needs to
// see which jobs to look at again when one fails.
const ROLES = ['owner', 'foreman'] as const;

export const load: PageServerLoad = async ({ params }) => {
	const user = requireRole(...ROLES);
	if (!isUuid(params.toolId)) error(404, 'No such torque tool.');
	const found = await toolWithChecks(user.shopId, params.toolId);
	if (!found) error(404, 'No such torque tool in this shop.');
	return { ...found, me: user.name };
};

export const actions = {
	check: async ({ request, params }) => {
		const user = requireRole(...ROLES);
		if (!isUuid(params.toolId)) error(404, 'No such torque tool.');
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = toolCheckSchema.safeParse(checkFormInput(values));
		if (!parsed.success) return refuse(parsed.error, { values });
		const r = await recordCheck(user.shopId, user.id, params.toolId, parsed.data);
		if (!r.ok) return r.kind === 'not_found' ? orError(r) : refuse(r, { values });
		return {
			done: r.result.passed
				? `Check recorded: passed, largest deviation ${r.result.worstPct.toFixed(2)} % (limit ±${r.permissiblePct} %).`
				: `Check recorded: FAILED, largest deviation ${r.result.worstPct.toFixed(2)} % (limit ±${r.permissiblePct} %). Take the tool out of use until it is adjusted and checked again.`,
			passed: r.result.passed
		};
	}
} satisfies Actions;
