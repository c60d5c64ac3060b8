// "… at 10:30" is the shop's clock time, on the Bench's preview as on the server, whatever the
// device's own zone: a tablet left on another zone must not shift a back-dated entry by hours.
import { expect, test } from '@playwright/test';
import { db } from './helpers/bench-db';
import { crew, signInAs } from './helpers/crew';

// Pacific/Auckland keeps NZDT, UTC+13, in December (IANA time zone database): read there,
// "10:30" would be 21:30 UTC the day before, and show as such on the shop's clock.
test.use({ timezoneId: 'Pacific/Auckland' });

test('a back-dated phrase is read on the shop clock on the Bench and on the server', async ({
	page
}) => {
	const [tech] = await crew(1);
	const [shop] = await db()`select s.time_zone from shop s join job j on j.shop_id = s.id
		where j.id = ${tech.jobId}`;
	await signInAs(page, tech);
	await page.goto(`/bench?job=${tech.jobNumber}`);
	const bar = page.getByRole('combobox', { name: 'Call bar' });
	const text = 'rear axle nut 88 nm at 00:05';
	await bar.fill(text);
	const when = page.getByTestId('candidate').first().getByTestId('preview-when');
	await expect(when).toContainText('00:05');
	await page.keyboard.press('Enter');
	await expect(bar).toHaveValue('');
	await expect
		.poll(
			async () =>
				(
					await db()`select 1 from log_entry where job_id = ${tech.jobId}
			and raw_text = ${text}`
				).length
		)
		.toBe(1);
	const [row] = await db()`select to_char(occurred_at at time zone ${shop.time_zone}, 'HH24:MI')
		as shop_clock from log_entry where job_id = ${tech.jobId} and raw_text = ${text}`;
	expect(row.shop_clock).toBe('00:05');
});
