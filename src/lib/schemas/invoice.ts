import { z } from 'zod';
import { emailField } from './auth';

const uuid = (what: string) => z.uuid(`Pick ${what}.`);

export const labourModeSchema = z.object({
	labourMode: z.enum(['flat_rate', 'clock'], { error: 'Choose flat-rate hours or clock time.' })
});

export const manualLineSchema = z.object({
	kind: z.enum(['sundry', 'discount'], { error: 'Choose a sundry or a discount.' }),
	description: z
		.string({ error: 'Say what the line is for.' })
		.trim()
		.min(1, 'Say what the line is for.')
		.max(200, 'At most 200 characters.'),
	quantity: z.coerce
		.number({ error: 'Type a quantity.' })
		.positive('The quantity must be more than zero.')
		.max(10_000, 'At most 10 000.'),
	/** In major units as typed ("12.50"); read with parseMoney in the shop's currency. */
	unitPrice: z
		.string({ error: 'Type an amount.' })
		.trim()
		.min(1, 'Type an amount.')
		.max(20, 'That amount is too long.')
});

export const lineIdSchema = z.object({ lineId: uuid('a line') });

export const pickPartSchema = z.object({ lineId: uuid('a line'), partId: uuid('a part') });

export const invoiceIdSchema = z.object({ invoiceId: uuid('an invoice') });

export const creditSchema = z.object({
	invoiceId: uuid('an invoice'),
	reason: z
		.string({ error: 'Say why the invoice is credited.' })
		.trim()
		.min(3, 'Say why the invoice is credited.')
		.max(500, 'At most 500 characters.')
});

export const counterPaymentSchema = z.object({
	invoiceId: uuid('an invoice'),
	method: z.enum(['cash', 'card'], { error: 'Choose cash or card.' }),
	amount: z
		.string({ error: 'Type the amount received.' })
		.trim()
		.min(1, 'Type the amount received.')
		.max(20)
});

export const emailInvoiceSchema = z.object({ invoiceId: uuid('an invoice'), to: emailField });
