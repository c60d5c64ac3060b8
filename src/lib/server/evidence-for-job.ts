// The evidence pack of one job card and the owner's log check, for the routes; evidence.ts and
// chain-verify.ts take their SQL client as an argument so that scripts (bench:evidence, db:verify)
// run them outside the app.
import { client } from './db';
import { verifyChains } from './chain-verify';
import { loadEvidenceByNumber } from './evidence';
import { evidencePdfStream } from './evidence-pdf';
import { makeMissingCopies } from './photos';
import { uploads } from './storage';
import { hashMissing } from './thumbs';
import type { EvidencePack } from '$lib/evidence/pack';

/** The pack of the job with this card number in this shop; null for any other. */
export function evidenceForJob(shopId: string, rawNumber: string) {
	return loadEvidenceByNumber(client, shopId, rawNumber);
}

/** The pack for the JSON export: every photo's SHA-256 read (and recorded) if it was not yet. */
export async function evidenceJsonForJob(shopId: string, rawNumber: string) {
	const pack = await loadEvidenceByNumber(client, shopId, rawNumber);
	if (pack) await hashMissing(client, uploads(), pack.photos);
	return pack;
}

/**
 * The pack's PDF as it is drawn. Copies made for it are recorded; photos it had no time to copy
 * go to the background backfill, so the next pack of the job draws them.
 */
export function evidencePdfForJob(pack: EvidencePack) {
	return evidencePdfStream(pack, uploads(), {
		sql: client,
		leftForLater: () => makeMissingCopies()
	});
}

/** The owner's log check (/shop/log-check): every job chain of the shop recomputed. */
export function verifyShopChains(shopId: string) {
	return verifyChains(client, shopId);
}
