import { describe, expect, it } from 'vitest';
import { counterPaymentSchema, emailInvoiceSchema, manualLineSchema } from './invoice';

describe('invoice form schemas', () => {
	it('reads a sundry line and refuses an empty description or a zero quantity', () => {
		expect(
			manualLineSchema.parse({
				kind: 'sundry',
				description: ' Workshop consumables ',
				quantity: '1',
				unitPrice: '4.50'
			})
		).toEqual({
			kind: 'sundry',
			description: 'Workshop consumables',
			quantity: 1,
			unitPrice: '4.50'
		});
		const bad = manualLineSchema.safeParse({
			kind: 'sundry',
			description: '',
			quantity: '0',
			unitPrice: ''
		});
		expect(bad.success).toBe(false);
		expect(bad.error?.issues.map((i) => i.path[0])).toEqual([
			'description',
			'quantity',
			'unitPrice'
		]);
	});
	it('takes cash or card at the counter, never online', () => {
		const id = '8d7f2a6e-3b1c-4f3e-9a55-2f0c7e1d9b11';
		expect(
			counterPaymentSchema.safeParse({ invoiceId: id, method: 'cash', amount: '10' }).success
		).toBe(true);
		expect(
			counterPaymentSchema.safeParse({ invoiceId: id, method: 'online', amount: '10' }).success
		).toBe(false);
	});
	it('lower-cases the address an invoice goes to', () => {
		const id = '8d7f2a6e-3b1c-4f3e-9a55-2f0c7e1d9b11';
		expect(emailInvoiceSchema.parse({ invoiceId: id, to: 'Lotte@Example.TEST' }).to).toBe(
			'lotte@example.test'
		);
	});
});
