import { expect, test } from '@playwright/test';
import { demo, signIn } from './helpers/auth';

test('a service writer takes a walk-in from intake to an assigned job with two procedures', async ({
	page
}) => {
	await signIn(page, demo.writer);
	await page.goto('/jobs');
	await page.getByRole('link', { name: 'New job card' }).click();
	await expect(page.getByRole('heading', { name: 'New job card' })).toBeVisible();

	await page.getByLabel('Customer name').fill('Walk-in Wenna Example');
	await page.getByLabel('Phone').fill('+00 555 0199');
	await page.getByLabel('Registration').fill('ks 77 wlk');
	await page.getByLabel('Make').fill('Vantorra');
	await page.getByLabel('Model').fill('Strada 250');
	await page.getByLabel('Odometer', { exact: true }).fill('18250');
	await page.getByRole('checkbox', { name: /Periodic service, 6 000 km/ }).check();
	await page.getByRole('checkbox', { name: /Drive chain and sprocket renewal/ }).check();
	await page.getByLabel('Technician').selectOption({ label: 'Ruth Adeyemi-Holt' });
	await page.getByLabel('Bay').selectOption('Bay 3');

	// Forgetting the concern: the message sits beside the field and nothing typed is lost.
	await page.getByRole('button', { name: 'Open job card' }).click();
	await expect(page.getByText("Write down the customer's concern.")).toBeVisible();
	await expect(page.getByLabel('Customer name')).toHaveValue('Walk-in Wenna Example');
	await expect(page.getByRole('checkbox', { name: /Drive chain and sprocket/ })).toBeChecked();

	await page.getByLabel("Customer's concern").fill('Chain noisy; service due.');
	await page.getByRole('button', { name: 'Open job card' }).click();
	await expect(page).toHaveURL(/\/jobs\/\d+\?opened=1$/);
	await expect(page.getByRole('heading', { name: /^Job card \d+$/ })).toBeVisible();
	await expect(page.getByText('KS 77 WLK')).toBeVisible();
	await expect(page.getByRole('heading', { name: /Periodic service, 6 000 km/ })).toBeVisible();
	await expect(
		page.getByRole('heading', { name: /Drive chain and sprocket renewal/ })
	).toBeVisible();
	await expect(
		page.getByRole('combobox', { name: 'Technician' }).locator('option:checked')
	).toHaveText('Ruth Adeyemi-Holt');
	await expect(page.getByRole('combobox', { name: 'Bay' })).toHaveValue('Bay 3');
	await expect(page.getByText(/Open\s+by Dev Ramanathan/)).toBeVisible();

	// The new card is in the table, found by its registration.
	await page.goto('/jobs?q=ks77wlk');
	await expect(page.locator('tbody tr[data-row]')).toHaveCount(1);
	await expect(page.locator('tbody')).toContainText('Walk-in Wenna Example');
});

test('an owner imports a procedure file, and a CSV with a bad row saves nothing', async ({
	page
}) => {
	await signIn(page, demo.owner);
	await page.goto('/procedures/import');
	const file = {
		format: 'benchcall.procedures',
		version: 1,
		procedures: [
			{
				name: 'Front brake pads (imported demo)',
				appliesTo: 'Demo scooters',
				flatRateHours: 0.6,
				steps: [
					{ label: 'Caliper mounting bolts', unit: 'N.m', nominal: 30, min: 27, max: 33 },
					{ label: 'Test ride' }
				]
			}
		]
	};
	await page.getByLabel('File (.json or .csv)').setInputFiles({
		name: 'pads.json',
		mimeType: 'application/json',
		buffer: Buffer.from(JSON.stringify(file))
	});
	await page.getByRole('button', { name: 'Check the file' }).click();
	await expect(page.getByText('pads.json: ready to import')).toBeVisible();
	await page.getByRole('button', { name: 'Import 1 procedure' }).click();
	await expect(page).toHaveURL(/\/procedures\?imported=1/);
	await page.getByRole('link', { name: 'Front brake pads (imported demo)' }).click();
	await expect(page.getByText('27–33 N·m (nominal 30)')).toBeVisible();

	const csv = [
		'procedure,step,unit,nominal,min,max,tolerance',
		'Coolant renewal (csv demo),Radiator drain bolt,N.m,10,,,1',
		'Coolant renewal (csv demo),Coolant fill,furlongs,1.2,,,'
	].join('\n');
	await page.goto('/procedures/import');
	await page.getByLabel('File (.json or .csv)').setInputFiles({
		name: 'coolant.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(csv)
	});
	await page.getByRole('button', { name: 'Check the file' }).click();
	await expect(page.getByText('coolant.csv: 1 problem, nothing saved')).toBeVisible();
	await expect(page.getByRole('alert')).toContainText(
		"row 3, column unit: Benchcall does not know the unit 'furlongs'."
	);
	await expect(page.getByRole('button', { name: /^Import/ })).toHaveCount(0);
	await page.goto('/procedures');
	await expect(page.getByText('Coolant renewal (csv demo)')).toHaveCount(0);

	// The JSON Schema of the file format is generated from its zod schema.
	const schema = await page.request.get('/api/procedures/schema');
	expect(schema.status()).toBe(200);
	expect((await schema.json()).title).toBe('Benchcall procedure file');
});

test('a technician cannot reach the Jobs, library editing or Shop settings pages', async ({
	page
}) => {
	await signIn(page, demo.tomasz);
	for (const path of ['/jobs', '/jobs/new', '/jobs/1042', '/procedures/import', '/shop/settings']) {
		const response = await page.goto(path);
		expect(response?.status(), path).toBe(403);
	}
});
