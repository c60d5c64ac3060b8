import { describe, expect, it } from 'vitest';
import { db } from './db';
import { makeShop } from './db/fixtures';
import * as s from './db/schema';
import { getInspection, setInspectionTick } from './floor/inspection';
import { changeInspectionItem, listInspectionItems, saveInspectionItem } from './inspection-items';

const labels = async (shopId: string) => (await listInspectionItems(shopId)).map((i) => i.label);

describe('the shop-configurable final-inspection checklist', () => {
	it('adds lines at the end, renames, refuses a duplicate, reorders and removes', async () => {
		const f = await makeShop('Checklist');
		expect(await saveInspectionItem(f.shop.id, { itemId: '', label: 'No leaks' })).toEqual({
			ok: true
		});
		await saveInspectionItem(f.shop.id, { itemId: '', label: 'Lights and horn' });
		await saveInspectionItem(f.shop.id, { itemId: '', label: 'Test ride' });
		expect(await labels(f.shop.id)).toEqual(['No leaks', 'Lights and horn', 'Test ride']);

		const dup = await saveInspectionItem(f.shop.id, { itemId: '', label: ' no LEAKS ' });
		expect(dup).toMatchObject({ ok: false, field: 'label' });

		const [first, second, third] = await listInspectionItems(f.shop.id);
		await saveInspectionItem(f.shop.id, { itemId: second.id, label: 'Lights, horn, indicators' });
		await changeInspectionItem(f.shop.id, third.id, 'up');
		expect(await labels(f.shop.id)).toEqual(['No leaks', 'Test ride', 'Lights, horn, indicators']);
		// Moving the first line up changes nothing.
		await changeInspectionItem(f.shop.id, first.id, 'up');
		expect((await labels(f.shop.id))[0]).toBe('No leaks');
		await changeInspectionItem(f.shop.id, first.id, 'remove');
		expect(await labels(f.shop.id)).toEqual(['Test ride', 'Lights, horn, indicators']);
		// The row is kept (inactive), so ticks on past jobs still point at it.
		const kept = await db.select().from(s.inspectionItem);
		expect(kept.find((i) => i.id === first.id)?.active).toBe(false);
	});

	it('a line removed after it was ticked still shows on that job; unticked ones leave', async () => {
		const f = await makeShop('Checklist history');
		await saveInspectionItem(f.shop.id, { itemId: '', label: 'Chain slack' });
		await saveInspectionItem(f.shop.id, { itemId: '', label: 'Cable routing' });
		const [chain, cables] = await listInspectionItems(f.shop.id);
		const owner = { id: f.owner.id, shopId: f.shop.id, name: f.owner.name };
		expect(await setInspectionTick(owner, f.job.id, chain.id, true)).toEqual({ ok: true });
		await changeInspectionItem(f.shop.id, chain.id, 'remove');
		await changeInspectionItem(f.shop.id, cables.id, 'remove');
		const state = (await getInspection(f.shop.id, f.job.id))!;
		expect(state.items.map((i) => [i.label, i.tickedBy])).toEqual([['Chain slack', 'Owner']]);
	});

	it("one shop cannot rename, move or remove another shop's line", async () => {
		const a = await makeShop('Checklist A');
		const b = await makeShop('Checklist B');
		await saveInspectionItem(a.shop.id, { itemId: '', label: 'Brakes' });
		const [brakes] = await listInspectionItems(a.shop.id);
		expect(await saveInspectionItem(b.shop.id, { itemId: brakes.id, label: 'Hijacked' })).toEqual({
			ok: false,
			kind: 'not_found',
			message: 'No such checklist item in this shop.'
		});
		expect((await changeInspectionItem(b.shop.id, brakes.id, 'remove')).ok).toBe(false);
		expect(await labels(a.shop.id)).toEqual(['Brakes']);
	});
});
