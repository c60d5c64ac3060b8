import { parseMoney } from '$lib/money';
import {
	inspectionItemChangeSchema,
	inspectionItemSchema,
	partSchema,
	settingsSchema,
	toolSchema
} from '$lib/schemas/shop';
import { echoValues } from '$lib/schemas/form';
import { failure } from '$lib/result';
import { requireRole } from '$lib/server/auth';
import {
	changeInspectionItem,
	listInspectionItems,
	saveInspectionItem
} from '$lib/server/inspection-items';
import { refuse } from '$lib/server/http';
import { readForm } from '$lib/server/request';
import { listParts, savePart } from '$lib/server/price-list';
import { getShop } from '$lib/server/shop';
import { listTools, saveTool, updateSettings } from '$lib/server/shop-settings';
import { calibrationDue } from '$lib/torque';
import { lastChecks } from '$lib/server/tool-checks';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const user = requireRole('owner');
	const [shop, parts, tools, checklist, checks] = await Promise.all([
		getShop(user.shopId),
		listParts(user.shopId, { all: true }),
		listTools(user.shopId),
		listInspectionItems(user.shopId),
		lastChecks(user.shopId)
	]);
	if (!shop) throw new Error('The signed-in user has no shop.');
	return {
		shop,
		parts,
		checklist,
		tools: tools.map((t) => ({
			...t,
			lastCheck: checks.get(t.id) ?? null,
			// ISO 6789 / tool makers' guidance: 12 months unless the shop or the tool says otherwise.
			due: t.calibratedOn
				? calibrationDue(t.calibratedOn, { months: t.intervalMonths ?? shop.calibrationMonths })
				: null
		}))
	};
};

export const actions = {
	settings: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const parsed = settingsSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'settings', values });
		}
		const rate = parseMoney(parsed.data.labourRate, parsed.data.currency);
		if (!rate.ok || rate.minor < 0) {
			const why = rate.ok ? 'The rate cannot be negative.' : rate.error;
			return refuse(failure('invalid', why, 'labourRate'), { action: 'settings', values });
		}
		await updateSettings(user.shopId, {
			currency: parsed.data.currency,
			labourRateMinor: rate.minor,
			taxRateBp: Math.round(parsed.data.taxRatePct * 100),
			defaultTolerancePct: parsed.data.defaultTolerancePct,
			idleGapMinutes: parsed.data.idleGapMinutes,
			calibrationMonths: parsed.data.calibrationMonths,
			bays: parsed.data.bays,
			locale: parsed.data.locale,
			timeZone: parsed.data.timeZone
		});
		return { action: 'settings', done: 'Settings saved.' };
	},
	part: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const key = values.partId || 'new';
		const parsed = partSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'part', key, values });
		}
		const r = await savePart(user.shopId, parsed.data);
		if (!r.ok) return refuse(r, { action: 'part', key, values });
		return { action: 'part', key, done: `${parsed.data.code} saved.` };
	},
	tool: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const key = values.toolId || 'new';
		const parsed = toolSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'tool', key, values });
		}
		const r = await saveTool(user.shopId, parsed.data);
		if (!r.ok) return refuse(r, { action: 'tool', key, values });
		return { action: 'tool', key, done: `${parsed.data.identifier} saved.` };
	},
	checkItem: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const key = values.itemId || 'new';
		const parsed = inspectionItemSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return refuse(parsed.error, { action: 'checkItem', key, values });
		}
		const r = await saveInspectionItem(user.shopId, parsed.data);
		if (!r.ok) return refuse(r, { action: 'checkItem', key, values });
		return {
			action: 'checkItem',
			key,
			done: parsed.data.itemId
				? `Checklist line renamed to "${parsed.data.label}".`
				: `"${parsed.data.label}" added to the final-inspection checklist.`
		};
	},
	checkItemChange: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const parsed = inspectionItemChangeSchema.safeParse(Object.fromEntries(form));
		const key = typeof form.get('itemId') === 'string' ? String(form.get('itemId')) : 'new';
		if (!parsed.success) {
			const why = parsed.error.issues[0]?.message ?? 'Check the form.';
			return refuse(failure('invalid', why), { action: 'checkItem', key });
		}
		const r = await changeInspectionItem(user.shopId, parsed.data.itemId, parsed.data.change);
		if (!r.ok) return refuse(r, { action: 'checkItem', key });
		return {
			action: 'checkItem',
			key,
			done:
				parsed.data.change === 'remove'
					? 'Line removed from the checklist. Jobs that already ticked it still show it.'
					: 'Checklist order saved.'
		};
	}
} satisfies Actions;
