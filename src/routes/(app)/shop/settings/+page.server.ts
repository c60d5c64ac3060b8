import { fail } from '@sveltejs/kit';
import { parseMoney } from '$lib/money';
import {
	inspectionItemChangeSchema,
	inspectionItemSchema,
	partSchema,
	settingsSchema,
	toolSchema
} from '$lib/schemas/shop';
import { echoValues, fieldErrors, formError } from '$lib/schemas/form';
import { requireRole } from '$lib/server/auth';
import {
	changeInspectionItem,
	listInspectionItems,
	saveInspectionItem
} from '$lib/server/inspection-items';
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
			return fail(400, { action: 'settings', values, errors: fieldErrors(parsed.error) });
		}
		const rate = parseMoney(parsed.data.labourRate, parsed.data.currency);
		if (!rate.ok || rate.minor < 0) {
			return fail(400, {
				action: 'settings',
				values,
				errors: formError(rate.ok ? 'The rate cannot be negative.' : rate.error, 'labourRate')
			});
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
			return fail(400, { action: 'part', key, values, errors: fieldErrors(parsed.error) });
		}
		const r = await savePart(user.shopId, parsed.data);
		if (!r.ok) {
			return fail(r.status ?? 400, {
				action: 'part',
				key,
				values,
				errors: formError(r.message, r.field)
			});
		}
		return { action: 'part', key, done: `${parsed.data.code} saved.` };
	},
	tool: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const key = values.toolId || 'new';
		const parsed = toolSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, { action: 'tool', key, values, errors: fieldErrors(parsed.error) });
		}
		const r = await saveTool(user.shopId, parsed.data);
		if (!r.ok) {
			return fail(r.status ?? 400, {
				action: 'tool',
				key,
				values,
				errors: formError(r.message, r.field)
			});
		}
		return { action: 'tool', key, done: `${parsed.data.identifier} saved.` };
	},
	checkItem: async ({ request }) => {
		const user = requireRole('owner');
		const form = await readForm(request);
		const values = echoValues(form);
		const key = values.itemId || 'new';
		const parsed = inspectionItemSchema.safeParse(Object.fromEntries(form));
		if (!parsed.success) {
			return fail(400, { action: 'checkItem', key, values, errors: fieldErrors(parsed.error) });
		}
		const r = await saveInspectionItem(user.shopId, parsed.data);
		if (!r.ok) {
			return fail(r.status ?? 400, {
				action: 'checkItem',
				key,
				values,
				errors: formError(r.message, r.field)
			});
		}
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
			return fail(400, {
				action: 'checkItem',
				key,
				errors: formError(parsed.error.issues[0]?.message ?? 'Check the form.')
			});
		}
		const r = await changeInspectionItem(user.shopId, parsed.data.itemId, parsed.data.change);
		if (!r.ok) {
			return fail(r.status ?? 400, { action: 'checkItem', key, errors: formError(r.message) });
		}
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
