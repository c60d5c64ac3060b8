// The invoice (or credit note) and the job's work report as one PDF, drawn with pdfkit.
import PDFDocument from 'pdfkit';
import { shopFormat } from '$lib/format';
import { formatMoney } from '$lib/money';
import { formatNumber } from '$lib/units';
import type { InvoiceWithLines, JobHeader } from './invoices';
import type { ReportEntry, WorkReport } from './work-report';

export const NOTICE_LINE =
	"Benchcall records and checks what was entered against the shop's specs. The maker's service manual, the shop's procedures, local regulations and licensed practice come first.";

/** pdfkit's built-in Helvetica speaks Windows-1252: keep those characters, replace the rest. */
const WIN_ANSI_EXTRA = '€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ';
export function pdfSafe(s: string): string {
	return s
		.replace(/[\u202f\u2009\u2007]/g, ' ')
		.replace(/≥/g, '>=')
		.replace(/≤/g, '<=')
		.replace(/−/g, '-')
		.replace(/[^\n\x20-\x7e\xa0-\xff]/g, (c) => (WIN_ANSI_EXTRA.includes(c) ? c : '?'));
}

export interface PdfShop {
	name: string;
	/** The shop's date and number style (BCP 47 tag and IANA zone); en-GB and UTC when unset. */
	locale?: string;
	timeZone?: string;
}

function title(inv: InvoiceWithLines): string {
	if (inv.kind === 'credit_note') return `Credit note ${inv.number}`;
	if (inv.status === 'draft') return 'Draft invoice (not issued)';
	return `Invoice ${inv.number}`;
}

export function invoicePdf(opts: {
	shop: PdfShop;
	job: Pick<JobHeader, 'number' | 'customerName' | 'registration' | 'make' | 'model' | 'concern'>;
	invoice: InvoiceWithLines;
	report: WorkReport;
	creditForNumber?: number | null;
}): Promise<Buffer> {
	const { shop, job, invoice: inv, report } = opts;
	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: 50, bottom: 60, left: 50, right: 50 },
		info: { Title: `${title(inv)} - ${shop.name}`, Author: shop.name, Creator: 'Benchcall' },
		bufferPages: true
	});
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<Buffer>((resolve, reject) => {
		doc.on('end', () => resolve(Buffer.concat(chunks)));
		doc.on('error', reject);
	});
	const fmt = shopFormat(shop);
	// the zone is named: a printed time travels further than the shop's clock
	const when = (d: Date) => `${fmt.dateTime(d)} (${fmt.timeZone})`;
	const money = (m: number) => pdfSafe(formatMoney(m, inv.currency, fmt.locale));
	const left = doc.page.margins.left;
	const width = doc.page.width - left - doc.page.margins.right;
	const text = (s: string, o: PDFKit.Mixins.TextOptions = {}) => doc.text(pdfSafe(s), o);

	// Heading.
	doc.font('Helvetica-Bold').fontSize(18);
	text(shop.name);
	doc.moveDown(0.3).fontSize(14);
	text(title(inv));
	doc.font('Helvetica').fontSize(10).moveDown(0.5);
	if (inv.issuedAt) text(`Issued: ${when(inv.issuedAt)}`);
	if (opts.creditForNumber) text(`Credits invoice ${opts.creditForNumber} in full.`);
	text(`Job card: ${job.number}`);
	text(`Customer: ${job.customerName ?? '-'}`);
	text(`Vehicle: ${[job.registration, job.make, job.model].filter(Boolean).join(' · ') || '-'}`);
	if (job.concern) text(`Concern: ${job.concern}`);
	doc.moveDown();

	// Lines.
	const cols = [
		{ h: 'Description', w: width * 0.46, align: 'left' as const },
		{ h: 'Quantity', w: width * 0.16, align: 'right' as const },
		{ h: 'Unit price', w: width * 0.18, align: 'right' as const },
		{ h: 'Amount', w: width * 0.2, align: 'right' as const }
	];
	const row = (cells: string[], bold = false) => {
		doc.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(9.5);
		const y = doc.y;
		let x = left;
		let h = 0;
		cells.forEach((c, i) => {
			const o = { width: cols[i].w - 6, align: cols[i].align };
			h = Math.max(h, doc.heightOfString(pdfSafe(c), o));
			doc.text(pdfSafe(c), x, y, o);
			x += cols[i].w;
		});
		doc.x = left;
		doc.y = y + h + 4;
		if (doc.y > doc.page.height - 90) doc.addPage();
	};
	row(
		cols.map((c) => c.h),
		true
	);
	doc
		.moveTo(left, doc.y - 2)
		.lineTo(left + width, doc.y - 2)
		.strokeColor('#888')
		.stroke();
	for (const l of inv.lines) {
		const qty = `${formatNumber(l.quantity, { maxDecimals: 3 })} ${l.unit}`;
		row([
			(l.unmatched ? '[no price yet] ' : '') + l.description,
			qty,
			money(l.unitPriceMinor),
			money(l.amountMinor)
		]);
	}
	doc.moveDown(0.5);
	const totals: [string, number][] = [
		['Subtotal', inv.subtotalMinor],
		[`Tax ${formatNumber(inv.taxRateBp / 100)} %`, inv.taxMinor],
		['Total', inv.totalMinor]
	];
	for (const [label, v] of totals) {
		row(['', '', label, money(v)], label === 'Total');
	}
	doc.moveDown(0.5).font('Helvetica').fontSize(9);
	text(
		'Amounts are rounded per line to the smallest unit of the currency (halves away from zero); the totals are sums of the rounded lines.',
		{ width }
	);
	if (inv.status === 'paid') {
		doc.moveDown(0.3).font('Helvetica-Bold');
		text(`Paid${inv.paidAt ? ` on ${when(inv.paidAt)}` : ''}. Thank you.`);
	} else if (inv.payments.length > 0) {
		text(`Received so far: ${money(inv.paidMinor)}.`);
	}

	// Work report.
	doc.addPage();
	doc.font('Helvetica-Bold').fontSize(14);
	text(`Work report, job card ${job.number}`);
	doc.font('Helvetica').fontSize(9).moveDown(0.3);
	text(
		'Every step with the value logged, its spec and verdict, who logged it and when. Retracted entries stay on the record, struck through, with the retraction that withdrew them.',
		{ width }
	);
	doc.moveDown(0.5);
	const entryLine = (e: ReportEntry) => {
		const parts = [
			when(e.at),
			e.by,
			e.what,
			e.value ? e.value : null,
			e.verdict ? `verdict: ${e.verdict}` : null,
			e.note && e.kind !== 'note' ? e.note : e.kind === 'note' ? e.note : null
		].filter(Boolean);
		doc
			.font('Helvetica')
			.fontSize(9)
			.fillColor(e.retracted ? '#777' : '#000');
		text(`    ${parts.join(' - ')}${e.retracted ? ' (retracted)' : ''}`, {
			width,
			strike: e.retracted
		});
		doc.fillColor('#000');
	};
	for (const p of report.procedures) {
		doc.font('Helvetica-Bold').fontSize(11).moveDown(0.4);
		text(p.name);
		for (const s of p.steps) {
			doc.font('Helvetica-Bold').fontSize(9.5).moveDown(0.2);
			text(`${s.label} - spec: ${s.spec}`, { width });
			if (s.entries.length === 0) {
				doc.font('Helvetica-Oblique').fontSize(9);
				text('    nothing logged');
			}
			s.entries.forEach(entryLine);
		}
	}
	if (report.general.length) {
		doc.font('Helvetica-Bold').fontSize(11).moveDown(0.4);
		text('Other entries');
		report.general.forEach(entryLine);
	}
	doc.moveDown(0.5).font('Helvetica').fontSize(9.5);
	text(
		report.signedOffAt
			? `Signed off by ${report.signedOffBy ?? 'the foreman'} on ${when(report.signedOffAt)}.`
			: 'Not signed off.'
	);

	// The standing notice on every page, in the bottom margin.
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const bottom = doc.page.margins.bottom;
		doc.page.margins.bottom = 0;
		doc.font('Helvetica').fontSize(7.5).fillColor('#444');
		doc.text(pdfSafe(NOTICE_LINE), left, doc.page.height - 45, { width, align: 'left' });
		doc.text(`Page ${i + 1} of ${range.count}`, left, doc.page.height - 25, {
			width,
			align: 'right'
		});
		doc.page.margins.bottom = bottom;
	}
	doc.end();
	return done;
}
