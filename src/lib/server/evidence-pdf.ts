// The evidence pack as a PDF (pdfkit): the vehicle and job, every entry in chain order with
// device and server time, who, the spec and the tool at the time, retractions and the foreman's
// decisions, the photos downscaled a few at a time (sharp), and the head hash with how to check it.
// The PDF is a stream: the route sends each page as it is drawn instead of holding the file.
import { adapterLine } from '$lib/torque/adapter';
import PDFDocument from 'pdfkit';
import { formatQuantity } from '$lib/units';
import { verdictWords } from '$lib/invoice/report';
import { HOW_TO_CHECK, type EvidenceEntry, type EvidencePack } from '$lib/evidence/pack';
import { NOTICE_LINE, pdfSafe } from './invoice-pdf';
import type { FileStorage } from './storage';
import { PHOTO_LONG_SIDE, smallPhotos, type SmallPhoto } from './thumbs';

const KIND_WORDS: Record<string, string> = {
	measure: 'Measured',
	part: 'Part fitted',
	note: 'Note',
	done: 'Done',
	retraction: 'Retraction',
	accept: 'Foreman accepted',
	redo: 'Foreman ordered a redo',
	inspection: 'Final inspection item',
	sign_off: 'Signed off'
};

const utc = (iso: string) => iso.replace('T', ' ').replace(/\.(\d{3})\d*Z$/, '.$1 UTC');

function quantity(v: number | null, unit: string | null): string {
	if (v === null) return '';
	return unit ? formatQuantity(v, unit) : String(v);
}

function specLine(e: EvidenceEntry): string | null {
	if (!e.spec || !e.step) return null;
	const { unit, nominal, min, max } = e.spec;
	const u = unit ?? '';
	let band = 'no spec';
	if (min !== null && max !== null) band = `${quantity(min, u)} to ${quantity(max, u)}`;
	else if (min !== null) band = `at least ${quantity(min, u)}`;
	else if (max !== null) band = `at most ${quantity(max, u)}`;
	else if (nominal !== null) band = `${quantity(nominal, u)} (nominal)`;
	return `Step: ${e.step}; spec on the job at the time: ${band}`;
}

/** What stands in a photo's place when it cannot be drawn; the original, if any, is kept. */
export function photoPlaceholder(p: Extract<SmallPhoto, { ok: false }>): string {
	return p.reason === 'missing'
		? '(photo file missing from storage)'
		: '(photo kept, but it cannot be drawn here: not a JPEG, PNG or WebP image, or damaged)';
}

/** The pack's PDF as a stream of bytes, drawn while it is read. */
export function evidencePdfStream(pack: EvidencePack, storage: FileStorage): PDFKit.PDFDocument {
	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: 50, bottom: 50, left: 50, right: 50 },
		info: {
			Title: pdfSafe(`Evidence pack, job card ${pack.job.number} - ${pack.shop}`),
			Author: pdfSafe(pack.shop),
			Creator: 'Benchcall'
		}
	});
	draw(doc, pack, storage).then(
		() => {
			if (!doc.destroyed) doc.end();
		},
		(e: unknown) => doc.destroy(e instanceof Error ? e : new Error(String(e)))
	);
	return doc;
}

/** The pack's PDF in one buffer (tests, scripts). */
export async function evidencePdf(pack: EvidencePack, storage: FileStorage): Promise<Buffer> {
	const chunks: Buffer[] = [];
	for await (const c of evidencePdfStream(pack, storage)) chunks.push(c as Buffer);
	return Buffer.concat(chunks);
}

async function draw(doc: PDFKit.PDFDocument, pack: EvidencePack, storage: FileStorage) {
	const left = doc.page.margins.left;
	const width = doc.page.width - left - doc.page.margins.right;
	const text = (s: string, o: PDFKit.Mixins.TextOptions = {}) =>
		doc.text(pdfSafe(s), { width, ...o });
	const byId = new Map(pack.entries.map((e) => [e.id, e]));
	const head = pack.chain.headHash ?? '(no entries yet)';

	doc.font('Helvetica-Bold').fontSize(17);
	text(pack.shop);
	doc.fontSize(13).moveDown(0.2);
	text(`Evidence pack, job card ${pack.job.number}`);
	doc.font('Helvetica').fontSize(9.5).moveDown(0.4);
	text(`Made ${utc(pack.generatedAt)} from the job log as stored.`);
	const v = pack.vehicle;
	text(
		`Vehicle: ${v ? [v.registration, v.make, v.model, v.year, v.colour].filter(Boolean).join(' · ') : '-'}`
	);
	if (v?.vin) text(`VIN / frame number: ${v.vin}`);
	text(`Customer: ${pack.customer?.name ?? '-'}`);
	const odo = pack.job.odometer === null ? '-' : `${pack.job.odometer} ${pack.job.odometerUnit}`;
	text(`Opened ${utc(pack.job.openedAt)} · odometer ${odo} · state ${pack.job.state}`);
	if (pack.job.concern) text(`Concern: ${pack.job.concern}`);
	if (pack.job.technician) text(`Technician: ${pack.job.technician}`);
	if (pack.job.signedOffAt) {
		text(`Signed off ${utc(pack.job.signedOffAt)} by ${pack.job.signedOffBy ?? '?'}`);
	}

	doc.moveDown(0.6).font('Helvetica-Bold').fontSize(11);
	text(`Head hash of the job log (${pack.chain.entries} entries)`);
	doc.font('Courier').fontSize(9);
	text(head);
	doc.font('Helvetica').fontSize(8.5);
	for (const p of HOW_TO_CHECK) text(p, { paragraphGap: 3 });
	doc.fontSize(8);
	text(NOTICE_LINE);

	doc.moveDown(0.6).font('Helvetica-Bold').fontSize(11);
	text('Job log, in the order it was written');
	for (const e of pack.entries) {
		if (doc.y > doc.page.height - 120) doc.addPage();
		doc.moveDown(0.35).font('Helvetica-Bold').fontSize(9);
		const verdict = e.verdict ? ` · ${verdictWords[e.verdict] ?? e.verdict}` : '';
		text(
			`#${e.pos} ${KIND_WORDS[e.kind] ?? e.kind}${verdict} · ${e.author} (${e.authorRole.replace('_', ' ')})`
		);
		doc.font('Helvetica').fontSize(8.5);
		text(`Device time ${utc(e.deviceTime)} · server time ${utc(e.serverTime)} · ${e.source}`);
		let said = `“${e.text}”`;
		if (e.value !== null) {
			said += `: ${quantity(e.value, e.unit)}`;
			if (e.specValue !== null && e.specUnit && e.specUnit !== e.unit) {
				said += ` = ${quantity(e.specValue, e.specUnit)}`;
			}
		}
		text(said);
		const spec = specLine(e);
		if (spec) text(spec);
		if (e.tool) {
			const state = e.tool.calibrationOverdueAtTheTime
				? 'calibration OVERDUE'
				: 'calibration in date';
			text(
				`Torque tool ${e.tool.identifier}${e.tool.kind ? ` (${e.tool.kind})` : ''}: ${state} at the time`
			);
		}
		if (e.adapter) {
			text(`With ${adapterLine(e.adapter.mm, e.adapter.setting, e.adapter.settingUnit)}`);
		}
		const target = e.retracts ?? e.respondsTo;
		if (target) {
			const t = byId.get(target);
			const what = e.retracts ? 'Withdraws' : 'Answers';
			text(`${what} #${t?.pos ?? '?'} “${t?.text ?? target}”`);
		}
		if (e.note && e.note !== e.text) text(`Note: ${e.note}`);
		doc.font('Courier').fontSize(7).fillColor('#444');
		text(`hash ${e.hash}`);
		doc.fillColor('black');
	}

	if (pack.stateChanges.length > 0) {
		doc.moveDown(0.8).font('Helvetica-Bold').fontSize(11);
		text('Job state changes');
		doc.font('Helvetica').fontSize(8.5);
		for (const c of pack.stateChanges) {
			text(
				`${utc(c.at)} · ${c.from ?? 'new'} to ${c.to} · ${c.by ?? '?'}${c.reason ? ` · ${c.reason}` : ''}`
			);
		}
	}

	if (pack.photos.length > 0) {
		doc.addPage().font('Helvetica-Bold').fontSize(11);
		text(`Photos (${pack.photos.length}, downscaled to ${PHOTO_LONG_SIDE} px)`);
		const cell = (width - 12) / 2;
		const boxH = 170;
		let col = 0;
		let y = doc.y + 6;
		// A few photos in memory at a time: read, shrink, draw, let go.
		const images = smallPhotos(
			storage,
			pack.photos.map((p) => p.storageKey)
		);
		for (const p of pack.photos) {
			if (y + boxH + 24 > doc.page.height - doc.page.margins.bottom) {
				doc.addPage();
				y = doc.page.margins.top;
				col = 0;
			}
			if (doc.destroyed) return; // the reader went away: shrink no more photos
			const x = left + col * (cell + 12);
			let img: SmallPhoto = (await images.next()).value ?? { ok: false, reason: 'missing' };
			if (img.ok) {
				try {
					doc.image(img.bytes, x, y, { fit: [cell, boxH], align: 'center', valign: 'center' });
				} catch {
					img = { ok: false, reason: 'unreadable' }; // a damaged kept copy
				}
			}
			if (!img.ok) {
				doc.rect(x, y, cell, boxH).lineWidth(0.5).strokeColor('#888888').stroke();
				doc.strokeColor('black');
				doc
					.font('Helvetica')
					.fontSize(8)
					.text(photoPlaceholder(img), x + 8, y + boxH / 2 - 10, { width: cell - 16 });
			}
			const on = p.entryId ? byId.get(p.entryId) : undefined;
			doc
				.font('Helvetica')
				.fontSize(7.5)
				.text(
					pdfSafe(`${on ? `#${on.pos} ` : 'Intake '}${p.fileName} · ${utc(p.takenAt)}`),
					x,
					y + boxH + 3,
					{
						width: cell
					}
				);
			col = (col + 1) % 2;
			if (col === 0) y += boxH + 24;
		}
	}
}
