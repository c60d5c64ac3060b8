import { expect, test, type Page } from '@playwright/test';
import { demo, signIn } from './helpers/auth';
import { db, entry } from './helpers/bench-db';
import { callBar as bar, openBench } from './helpers/bench';
import { makeFloorJob } from './helpers/floor-db';

/** Retracts the entry just logged, leaving the demo job's log as the other tests see it. */
async function undoEntry(page: Page, id: string) {
	await bar(page).fill('undo');
	await page.keyboard.press('Enter');
	await expect(page.locator(`[data-entry-id="${id}"]`)).toHaveAttribute('data-retracted', 'yes');
}

async function toolId(identifier: string): Promise<string> {
	const [row] = await db()`
		select t.id from torque_tool t join shop s on s.id = t.shop_id
		where t.identifier = ${identifier} and s.name like 'Kettle Street%'`;
	return row.id as string;
}

test('the Bench works out the wrench setting for an adapter and keeps it with the entry', async ({
	page
}) => {
	await openBench(page, demo.tomasz, 1042);
	// demo tool TW-01 has an effective length of 310 mm (demo value)
	await page.getByLabel('Torque tool in use').selectOption(await toolId('TW-01'));
	await bar(page).fill('lower mount 55 nm adapter 50 mm');
	const top = page.getByTestId('candidate').first();
	// T × L / (L + E) = 55 × 310 / 360 = 47.36 N·m (the formula of US Army TM 1-1500-204-23-9's worked example)
	await expect(top.getByTestId('preview-setting')).toHaveText('47.4 N·m');
	await expect(top.getByTestId('preview-adapter')).toContainText('adapter 50 mm on TW-01');
	await page.keyboard.press('Enter');
	const first = page.getByTestId('log-entry').first();
	await expect(first.getByTestId('entry-adapter')).toHaveText('adapter 50 mm · set 47.4 N·m');
	const stored = await entry((await first.getAttribute('data-entry-id'))!);
	expect(stored).toMatchObject({ adapter_mm: 50, tool_length_mm: 310, wrench_setting_unit: 'N.m' });
	expect(stored!.wrench_setting).toBeCloseTo((55 * 310) / 360, 9);

	// a crowfoot at 90° needs no correction
	await bar(page).fill('spec lower mount crowfoot at 90');
	await expect(page.getByTestId('candidate').first().getByTestId('preview-setting')).toHaveText(
		'55 N·m'
	);
	// picked once beside the tool instead of said: the preview works it out the same way
	await page.getByTestId('adapter-direction').selectOption('out');
	await page.getByTestId('adapter-length').fill('50');
	await bar(page).fill('lower mount 55 nm');
	await expect(page.getByTestId('candidate').first().getByTestId('preview-setting')).toHaveText(
		'47.4 N·m'
	);
	await page.getByTestId('adapter-direction').selectOption('none');
	await undoEntry(page, stored!.id as string);
});

test('a step that calls for a crowfoot shows the wrench setting without it being said', async ({
	page
}) => {
	await signIn(page, demo.tomasz);
	await page.goto('/bench?job=1042');
	await expect(bar(page)).toBeFocused();
	await page.getByLabel('Torque tool in use').selectOption(await toolId('TW-01'));
	// demo step: exhaust header nuts, 18–22 N·m, done with a 45 mm crowfoot along the wrench
	await bar(page).fill('header nuts 20 nm');
	const top = page.getByTestId('candidate').first();
	// T × L / (L + E) = 20 × 310 / 355 = 17.46 N·m (the formula of US Army TM 1-1500-204-23-9's worked example)
	await expect(top.getByTestId('preview-setting')).toHaveText('17.5 N·m');
	await expect(top.getByTestId('preview-adapter')).toContainText('the step calls for this adapter');
	// an adapter said in the phrase overrides the step's
	await bar(page).fill('header nuts 20 nm crowfoot at 90');
	await expect(page.getByTestId('candidate').first().getByTestId('preview-setting')).toHaveText(
		'20 N·m'
	);
	await expect(
		page.getByTestId('candidate').first().getByTestId('preview-adapter')
	).not.toContainText('the step calls for');
	// logged without saying it: the entry records the step's adapter as it records a said one
	await bar(page).fill('header nuts 20 nm');
	await page.keyboard.press('Enter');
	const first = page.getByTestId('log-entry').first();
	await expect(first.getByTestId('entry-adapter')).toHaveText('adapter 45 mm · set 17.5 N·m');
	const stored = await entry((await first.getAttribute('data-entry-id'))!);
	expect(stored).toMatchObject({ adapter_mm: 45, tool_length_mm: 310, wrench_setting_unit: 'N.m' });
	expect(stored!.wrench_setting).toBeCloseTo((20 * 310) / 355, 9);
	await undoEntry(page, stored!.id as string);
});

test('a torque tool’s check: the failed tool names the jobs to revisit; a new check is judged', async ({
	page
}) => {
	await signIn(page, demo.owner);
	await page.goto('/shop/settings');
	await expect(page.getByTestId('tool-check-failed')).toContainText('Failed its check');
	// other tests add tools of their own: follow TW-02's own link
	await page.locator(`a[href="/shop/tools/${await toolId('TW-02')}"]`).click();
	await expect(page.getByRole('heading', { name: 'Torque tool TW-02' })).toBeVisible();
	await expect(page.getByTestId('tool-state')).toContainText('Failed its last check');
	await expect(page.getByTestId('revisit-job').first()).toBeVisible();
	await expect(page.getByTestId('check-row').first()).toContainText('▲ Failed');

	await page.goto(`/shop/tools/${await toolId('TW-01')}`);
	await expect(
		page.getByText('Permissible deviation for Type II class A click: ±4 %')
	).toBeVisible();
	// nothing entered: said, nothing recorded
	await page.getByRole('button', { name: 'Record the check of TW-01' }).click();
	await expect(page.getByTestId('check-error')).toContainText('at least one test point');
	await expect(page.getByTestId('check-row')).toHaveCount(1);
	// ISO 6789-1 Type II class A: ±4 % above 10 N·m (ISO 6789-1:2017, per a tool maker's summary); readings invented
	await page.getByLabel('Reading 1 at 12 N·m').fill('12.2');
	await page.getByLabel('Reading 1 at 36 N·m').fill('36.9');
	await page.getByLabel('Reading 1 at 60 N·m').fill('61.4');
	await page.getByRole('button', { name: 'Record the check of TW-01' }).click();
	await expect(page.getByTestId('check-done')).toContainText('passed, largest deviation 2.50 %');
	await expect(page.getByTestId('check-row')).toHaveCount(2);
	await expect(page.getByTestId('tool-state')).toContainText('Calibrated, next due');
});

test('a torque tool’s readings reach its drift on the Floor at once, and an undone one leaves it', async ({
	browser
}) => {
	// A job and a tool of this test's own, so no other spec's readings count here.
	const job = await makeFloorJob();
	const [tool] = await db()`
		insert into torque_tool (shop_id, identifier, kind, range_min, range_max, unit, calibrated_on)
		select id, ${`TW-E2E-${job.number}`}, 'Type II class A click', 40, 200, 'N.m', current_date
		from shop where name like 'Kettle Street%' returning id`;
	const techContext = await browser.newContext();
	const tech = await techContext.newPage();
	await signIn(tech, demo.tomasz);
	const callOut = async (text: string) => {
		const res = await tech.request.post(`/api/jobs/${job.id}/entries`, {
			data: { id: crypto.randomUUID(), text, source: 'typed', torqueToolId: tool.id }
		});
		expect(res.status(), await res.text()).toBe(201);
	};
	// The demo spec of the rear axle nut is 80–96 N·m: 120 is over; 9.2 kgf·m is 90.22 N·m, in
	// spec (1 kgf = 9.80665 N, NIST SP 811 appendix B).
	for (const text of ['rear axle 88 nm', 'rear axle 120 nm', 'rear axle 9.2 kgf m'])
		await callOut(text);

	const foremanContext = await browser.newContext();
	const foreman = await foremanContext.newPage();
	await signIn(foreman, demo.foreman);
	await foreman.goto(`/floor/drift?tool=${tool.id}`);
	const summary = foreman.getByTestId('drift-window-summary');
	await expect(summary).toContainText('3 readings, 1 out of spec.');
	await expect(summary).toContainText('All are drawn.');

	await callOut('undo'); // retracts the kgf·m reading: the log keeps both, drift drops it
	await foreman.reload();
	await expect(summary).toContainText('2 readings, 1 out of spec.');
	await techContext.close();
	await foremanContext.close();
});
