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
import type { Sql } from 'postgres';
import type { FileStorage } from './storage-disk';
import {
	PACK_COPY_BUDGET_MS,
	PACK_HASH_BUDGET_MS,
	PHOTO_LONG_SIDE,
	smallPhotos,
	type SmallPhoto
} from './thumbs';

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

const PHOTOS_NOTE =
	"Each SHA-256 is that of the original file as stored. The shop's Benchcall serves each original, unchanged, to its staff at /api/photos/<photo id> (the JSON export lists the ids); `sha256sum` on a downloaded original must print the same value.";

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

/**
 * What stands in photo `n`'s place when it cannot be drawn; the original, if any, is kept. The
 * job card lists intake photos only, so the line names the original's own address.
 */
export function photoPlaceholder(
	p: Extract<SmallPhoto, { ok: false }>,
	n: number,
	id: string
): string {
	if (p.reason === 'later') {
		return `Photo ${n}: copy being made; download the original at\n/api/photos/${id}`;
	}
	return p.reason === 'missing'
		? '(photo file missing from storage)'
		: '(photo kept, but it cannot be drawn here: not a JPEG, PNG or WebP image, or damaged)';
}

export interface PdfOptions {
	/** Records copies made and hashes read for the pack (the app's client; scripts pass theirs). */
	sql?: Sql;
	/**
	 * Milliseconds since the epoch after which no new copy is made for the pack (less the time
	 * kept for the photos after it): by default PACK_COPY_BUDGET_MS after the pack was read.
	 */
	deadline?: number;
	/** After this no original is read to hash it: by default PACK_HASH_BUDGET_MS after. */
	hashBy?: number;
	/** Called once when photos were left without a copy, with how many. */
	leftForLater?: (n: number) => void;
}

/** The pack's PDF as a stream of bytes, drawn while it is read. */
export function evidencePdfStream(
	pack: EvidencePack,
	storage: FileStorage,
	opts: PdfOptions = {}
): PDFKit.PDFDocument {
	const doc = new PDFDocument({
		size: 'A4',
		margins: { top: 50, bottom: 50, left: 50, right: 50 },
		info: {
			Title: pdfSafe(`Evidence pack, job card ${pack.job.number} - ${pack.shop}`),
			Author: pdfSafe(pack.shop),
			Creator: 'Benchcall'
		}
	});
	draw(doc, pack, storage, opts).then(
		() => {
			if (!doc.destroyed) doc.end();
		},
		(e: unknown) => doc.destroy(e instanceof Error ? e : new Error(String(e)))
	);
	return doc;
}

/** The pack's PDF in one buffer (tests, scripts). */
export async function evidencePdf(
	pack: EvidencePack,
	storage: FileStorage,
	opts: PdfOptions = {}
): Promise<Buffer> {
	const chunks: Buffer[] = [];
	for await (const c of evidencePdfStream(pack, storage, opts)) chunks.push(c as Buffer);
	return Buffer.concat(chunks);
}

async function draw(
	doc: PDFKit.PDFDocument,
	pack: EvidencePack,
	storage: FileStorage,
	opts: PdfOptions
) {
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

	if (pack.photos.length > 0) await drawPhotos(doc, pack, storage, opts, { left, width, byId });
}

async function drawPhotos(
	doc: PDFKit.PDFDocument,
	pack: EvidencePack,
	storage: FileStorage,
	opts: PdfOptions,
	{ left, width, byId }: { left: number; width: number; byId: Map<string, EvidenceEntry> }
) {
	doc.addPage().font('Helvetica-Bold').fontSize(11);
	doc.text(`Photos (${pack.photos.length}, downscaled to ${PHOTO_LONG_SIDE} px)`, { width });
	doc.font('Helvetica').fontSize(8.5);
	doc.text(PHOTOS_NOTE, { width });
	const cell = (width - 12) / 2;
	const boxH = 170;
	const rowH = boxH + 30;
	let col = 0;
	let y = doc.y + 6;
	let later = 0;
	// A few photos in memory at a time: read, shrink, draw, let go. Past the deadline, photos
	// without a copy get a line instead of a decode, so the pack keeps its time.
	const t0 = Date.parse(pack.generatedAt);
	const deadline = opts.deadline ?? t0 + PACK_COPY_BUDGET_MS;
	const hashBy = opts.hashBy ?? t0 + PACK_HASH_BUDGET_MS;
	// for await: leaving the loop early (the reader went away) still closes the generator, which
	// records the copies made so far.
	let i = -1;
	for await (const got of smallPhotos(storage, pack.photos, { deadline, hashBy, sql: opts.sql })) {
		const p = pack.photos[++i];
		if (y + rowH > doc.page.height - doc.page.margins.bottom) {
			doc.addPage();
			y = doc.page.margins.top;
			col = 0;
		}
		if (doc.destroyed) return; // the reader went away: shrink no more photos
		const x = left + col * (cell + 12);
		let img: SmallPhoto = got;
		if (img.ok) {
			try {
				doc.image(img.bytes, x, y, { fit: [cell, boxH], align: 'center', valign: 'center' });
			} catch {
				img = { ok: false, reason: 'unreadable', sha256: img.sha256 }; // a damaged kept copy
			}
		}
		if (!img.ok) {
			if (img.reason === 'later') later++;
			doc.rect(x, y, cell, boxH).lineWidth(0.5).strokeColor('#888888').stroke();
			doc.strokeColor('black');
			doc
				.font('Helvetica')
				.fontSize(7.5)
				.text(pdfSafe(photoPlaceholder(img, i + 1, p.id)), x + 8, y + boxH / 2 - 10, {
					width: cell - 16
				});
		}
		const on = p.entryId ? byId.get(p.entryId) : undefined;
		const where = on ? `#${on.pos}` : 'Intake';
		const caption = `Photo ${i + 1} · ${where} ${p.fileName} · ${utc(p.takenAt)}`;
		doc.font('Helvetica').fontSize(7.5);
		doc.text(pdfSafe(caption), x, y + boxH + 3, { width: cell, height: 9, ellipsis: true });
		// 72 Courier characters at 5.4 pt (0.6 em each) fit the cell on one line.
		const notRead = !img.ok && img.reason === 'later';
		const sha =
			img.sha256 ??
			p.sha256 ??
			(notRead ? 'not read yet: the JSON export reads it' : '(not known: file missing)');
		doc.font('Courier').fontSize(5.4).fillColor('#444');
		doc.text(`SHA-256 ${sha}`, x, y + boxH + 14, { width: cell, lineBreak: false });
		doc.fillColor('black');
		col = (col + 1) % 2;
		if (col === 0) y += rowH;
	}
	if (later > 0) opts.leftForLater?.(later);
}
