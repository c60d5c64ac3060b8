import { randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { expect, test, type Page } from '@playwright/test';
import { PDFParse } from 'pdf-parse';
import { demo, signIn } from './helpers/auth';
import { db } from './helpers/bench-db';

async function pdfText(path: string): Promise<string> {
	const parser = new PDFParse({ data: await readFile(path) });
	try {
		return (await parser.getText()).text;
	} finally {
		await parser.destroy();
	}
}

async function download(page: Page, click: () => Promise<void>) {
	const [d] = await Promise.all([page.waitForEvent('download'), click()]);
	const path = await d.path();
	return { path, name: d.suggestedFilename() };
}

test('signed-off job to draft, issue, PDF, e-mail, customer page, online payment, paid', async ({
	page,
	browser
}) => {
	test.setTimeout(90_000);
	await signIn(page, demo.writer);
	await page.goto('/jobs/1046');
	await page.getByRole('link', { name: 'Invoice', exact: true }).click();
	await expect(page).toHaveURL(/\/jobs\/1046\/invoice$/);

	await page.getByLabel('Flat-rate hours of the procedures').check();
	await page.getByRole('button', { name: 'Make the draft' }).click();
	const draft = page.getByRole('region', { name: 'Draft invoice' });
	// The oil was logged as 1.1 US qt: billed per litre as 1.041 L × €14.90 = €15.51.
	const oil = draft.getByRole('row', { name: /Engine oil SAE 10W-40/ });
	await expect(oil).toContainText('1.041 L');
	await expect(oil).toContainText('€15.51');
	await expect(draft.getByRole('row', { name: /Drain plug sealing washer/ })).toContainText(
		'€1.20'
	);
	// Logged by words only ("used chain lube spray on the chain"), matched on the price list.
	await expect(draft.getByRole('row', { name: /Chain lube spray 400 mL/ })).toContainText('€9.90');
	await expect(draft.getByRole('row', { name: /Labour, flat rate/ })).toContainText('1.5 h');

	// A sundry typed by the service writer; a bad amount is refused with a message.
	await draft.getByLabel('Description').fill('Workshop consumables');
	await draft.getByLabel('Unit price (EUR)').fill('2.505');
	await draft.getByRole('button', { name: 'Add line' }).click();
	await expect(page.getByText('EUR has 2 decimal places at most')).toBeVisible();
	await draft.getByLabel('Unit price (EUR)').fill('2.50');
	await draft.getByRole('button', { name: 'Add line' }).click();
	await expect(draft.getByRole('row', { name: /Workshop consumables/ })).toContainText('€2.50');

	await draft.getByRole('button', { name: 'Issue invoice' }).click();
	await expect(page.getByRole('status')).toContainText(/Invoice \d+ issued/);
	const issued = page.getByRole('region', { name: /^Invoice \d+$/ });
	const heading = (await issued.getByRole('heading', { level: 2 }).textContent())!.trim();
	const number = heading.replace(/\D+/g, '');
	await expect(issued.getByRole('button', { name: 'Issue invoice' })).toHaveCount(0);

	const pdf = await download(page, () => issued.getByRole('link', { name: 'PDF' }).click());
	expect(pdf.name).toBe(`invoice-${number}.pdf`);
	const text = await pdfText(pdf.path);
	expect(text).toContain(`Invoice ${number}`);
	expect(text).toContain('1.041 L');
	expect(text).toContain('Work report, job card 1046');
	expect(text).toMatch(/Engine oil fill - spec: 1.?1.?2 L/);
	expect(text).toContain('(retracted)');
	expect(text).toContain('foreman accepted');
	expect(text).toContain("The maker's service manual");

	const csv = await download(page, () => issued.getByRole('link', { name: 'CSV' }).click());
	expect(await readFile(csv.path, 'utf8')).toContain(',fluid,');

	await expect(issued.getByLabel('E-mail to the customer')).toHaveValue('lotte@example.test');
	await issued.getByRole('button', { name: 'Send with the PDF' }).click();
	await expect(page.getByRole('status')).toContainText('Sent to lotte@example.test');

	await page.goto('/shop/outbox');
	await page.getByRole('link', { name: new RegExp(`Invoice ${number} from`) }).click();
	await expect(page.getByText(/Accepted: .*Kept by the local sink/)).toBeVisible();
	const att = await download(page, () =>
		page.getByRole('link', { name: `invoice-${number}.pdf` }).click()
	);
	expect(await pdfText(att.path)).toContain(`Invoice ${number}`);
	const mailText = await page.locator('pre').textContent();
	const link = /\/r\/[A-Za-z0-9_-]{43}/.exec(mailText ?? '')?.[0];
	expect(link).toBeTruthy();

	// The customer: no sign-in.
	const customer = await browser.newContext();
	const c = await customer.newPage();
	await c.goto(link!);
	await expect(c.getByRole('heading', { name: `Invoice ${number}` })).toBeVisible();
	await expect(c.getByText('Work report')).toBeVisible();
	await c.getByRole('link', { name: /^Pay .* online$/ }).click();
	await expect(c.getByText('Local test payment provider: no money moves.')).toBeVisible();
	const fakePayUrl = c.url();
	await c.getByRole('button', { name: 'Pay now' }).click();
	await expect(c).toHaveURL(/\?paid=1$/);
	await c.reload();
	await expect(c.getByRole('status')).toContainText('Paid');
	// The provider delivers the same event again: nothing changes.
	const again = await c.request.post(fakePayUrl, { maxRedirects: 0 });
	expect(again.status()).toBe(303);
	await customer.close();

	await page.goto('/jobs/1046/invoice');
	const paid = page.getByRole('region', { name: `Invoice ${number}` });
	await expect(paid.getByText('Paid', { exact: true })).toBeVisible();
	await expect(paid.getByRole('listitem').filter({ hasText: 'online' })).toHaveCount(1);
	await page.goto('/jobs/1046');
	await expect(page.getByText('Paid').first()).toBeVisible();
});

test('the webhook refuses a forged signature', async ({ request }) => {
	const body = JSON.stringify({ id: 'evt_forged', type: 'checkout.session.completed' });
	const forged = await request.post('/api/payments/webhook', {
		data: body,
		headers: {
			'content-type': 'application/json',
			'stripe-signature': `t=${Math.floor(Date.now() / 1000)},v1=${'0'.repeat(64)}`
		}
	});
	expect(forged.status()).toBe(400);
	const unsigned = await request.post('/api/payments/webhook', {
		data: body,
		headers: { 'content-type': 'application/json' }
	});
	expect(unsigned.status()).toBe(400);
});

test("another shop cannot open this shop's invoice or its PDF", async ({ page }) => {
	// Real ids of this shop's invoice (issued by the first test of this file), so a 404 here can
	// only come from the other shop being kept out, not from ids that exist nowhere.
	const [mine] = await db()`
		select i.id, i.customer_token from invoice i join job j on j.id = i.job_id
		join shop s on s.id = j.shop_id
		where j.number = 1046 and s.name like 'Kettle Street%' and i.kind = 'invoice'
		order by i.created_at limit 1`;
	expect(mine, 'the first test issued an invoice for job 1046').toBeTruthy();
	await signIn(page, demo.writer);
	expect((await page.request.get(`/jobs/1046/invoice/${mine.id}/pdf`)).status()).toBe(200);
	await page.context().clearCookies();

	await signIn(page, demo.otherOwner);
	const r = await page.goto('/jobs/1046/invoice');
	expect(r?.status()).toBe(404);
	const pdf = await page.request.get(`/jobs/1046/invoice/${mine.id}/pdf`);
	expect(pdf.status()).toBe(404);
});

test('a refused invoice action answers with the status of its reason', async ({
	page,
	baseURL
}) => {
	// The first test of this file issued and was paid the invoice of job 1046: the job is paid.
	const [paid] = await db()`
		select i.id from invoice i join job j on j.id = i.job_id
		join shop s on s.id = j.shop_id
		where j.number = 1046 and s.name like 'Kettle Street%' and i.kind = 'invoice'
		and i.status = 'paid' order by i.created_at limit 1`;
	expect(paid, 'the first test was paid the invoice of job 1046').toBeTruthy();
	await signIn(page, demo.writer);
	// A form sent without the page's script (text/html): the answer's status is the refusal's.
	const act = async (action: string, form: Record<string, string>) => {
		const res = await page.request.post(`/jobs/1046/invoice?/${action}`, {
			form,
			headers: { origin: baseURL!, accept: 'text/html' },
			maxRedirects: 0
		});
		return res.status();
	};
	// Refused because of the job's or the invoice's state: 409.
	expect(await act('draft', { labourMode: 'flat_rate' }), 'a paid job is drafted again').toBe(409);
	expect(
		await act('addLine', { kind: 'sundry', description: 'Rags', quantity: '1', unitPrice: '1.00' }),
		'a line with no draft'
	).toBe(409);
	expect(await act('issue', { invoiceId: paid.id }), 'a paid invoice issued again').toBe(409);
	expect(
		await act('payment', { invoiceId: paid.id, method: 'cash', amount: '5.00' }),
		'a payment on a paid invoice'
	).toBe(409);
	// Input that cannot be used: 400.
	expect(await act('payment', { invoiceId: paid.id, method: 'cash', amount: 'five' })).toBe(400);
	expect(await act('issue', { invoiceId: 'not-an-id' })).toBe(400);
	// No such invoice on this job: 404.
	expect(await act('issue', { invoiceId: randomUUID() })).toBe(404);
});
