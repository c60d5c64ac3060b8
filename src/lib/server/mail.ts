// E-mail through nodemailer. The transport is SMTP_URL: the local sink that `npm start` and
// `npm test` run (scripts/lib/fakes.js), or a real relay in production. Every message is kept
// in mail_outbox as sent (RFC 5322 source), so the shop can see what went out.
import { failure, type Result } from '$lib/result';
import { env } from '$env/dynamic/private';
import { and, desc, eq } from 'drizzle-orm';
import nodemailer from 'nodemailer';
import MailComposer from 'nodemailer/lib/mail-composer';
import { db } from './db';
import { mailOutbox } from './db/schema';

export interface OutgoingMail {
	shopId: string;
	invoiceId?: string | null;
	sentBy?: string | null;
	from: string;
	replyTo?: string;
	to: string;
	subject: string;
	text: string;
	attachments?: { filename: string; content: Buffer; contentType: string }[];
}

export function mailFrom(shopName: string): string {
	const address = env.MAIL_FROM_ADDRESS || 'invoices@benchcall.test';
	return `"${shopName.replace(/["\\]/g, '')}" <${address}>`;
}

/** Sends one message and records it; answers whether the transport accepted it. */
export async function sendMail(m: OutgoingMail): Promise<Result<{ message: string }>> {
	const raw = await new MailComposer({
		from: m.from,
		replyTo: m.replyTo,
		to: m.to,
		subject: m.subject,
		text: m.text,
		attachments: m.attachments
	})
		.compile()
		.build();
	let status: 'sent' | 'failed' = 'failed';
	let response: string;
	let messageId: string | null = null;
	if (!env.SMTP_URL) {
		response = 'No mail transport is set up (SMTP_URL is empty).';
	} else {
		try {
			const transport = nodemailer.createTransport(env.SMTP_URL);
			const info = await transport.sendMail({
				envelope: { from: m.from, to: [m.to] },
				raw
			});
			status = info.accepted.length > 0 ? 'sent' : 'failed';
			response = info.response;
			messageId = info.messageId ?? null;
			transport.close();
		} catch (err) {
			response = `The mail server did not take the message: ${(err as Error).message}`;
		}
	}
	const idMatch = /^Message-ID:\s*(<[^>]+>)/im.exec(raw.toString('utf8'));
	await db.insert(mailOutbox).values({
		shopId: m.shopId,
		invoiceId: m.invoiceId ?? null,
		toAddress: m.to,
		subject: m.subject,
		messageId: messageId ?? idMatch?.[1] ?? null,
		status,
		response,
		raw: raw.toString('utf8'),
		sentBy: m.sentBy ?? null
	});
	// A transport that refused or failed is `upstream`: the message waits in the outbox, retry.
	return status === 'sent'
		? { ok: true, message: `Sent to ${m.to}.` }
		: failure('upstream', response);
}

export async function listOutbox(shopId: string, limit = 100) {
	return db
		.select({
			id: mailOutbox.id,
			toAddress: mailOutbox.toAddress,
			subject: mailOutbox.subject,
			status: mailOutbox.status,
			response: mailOutbox.response,
			createdAt: mailOutbox.createdAt,
			invoiceId: mailOutbox.invoiceId
		})
		.from(mailOutbox)
		.where(eq(mailOutbox.shopId, shopId))
		.orderBy(desc(mailOutbox.createdAt))
		.limit(limit);
}

export async function getOutboxMessage(shopId: string, id: string) {
	const [row] = await db
		.select()
		.from(mailOutbox)
		.where(and(eq(mailOutbox.shopId, shopId), eq(mailOutbox.id, id)))
		.limit(1);
	return row ?? null;
}
