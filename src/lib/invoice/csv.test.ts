import { describe, expect, it } from 'vitest';
import { linesCsv } from './csv';

describe('invoice lines as CSV', () => {
	it('writes amounts in major units and quotes what needs quoting (RFC 4180)', () => {
		const csv = linesCsv(
			[
				{
					position: 1,
					kind: 'fluid',
					description: 'Engine oil, 10W-40 "bulk"',
					quantity: 1.041,
					unit: 'L',
					unitPriceMinor: 1490,
					amountMinor: 1551,
					taxRateBp: 2000,
					taxMinor: 310
				},
				{
					position: 2,
					kind: 'discount',
					description: '-5 loyal customer',
					quantity: 1,
					unit: 'each',
					unitPriceMinor: -500,
					amountMinor: -500,
					taxRateBp: 2000,
					taxMinor: -100
				}
			],
			'EUR'
		);
		expect(csv.split('\r\n')).toEqual([
			'position,kind,description,quantity,unit,unit_price_EUR,amount_EUR,tax_rate_percent,tax_EUR',
			'1,fluid,"Engine oil, 10W-40 ""bulk""",1.041,L,14.90,15.51,20,3.10',
			"2,discount,'-5 loyal customer,1,each,-5.00,-5.00,20,-1.00",
			''
		]);
	});
});
