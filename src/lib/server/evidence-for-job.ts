// The evidence pack of one job card and the owner's log check, for the routes; evidence.ts and
// chain-verify.ts take their SQL client as an argument so that scripts (bench:evidence, db:verify)
// run them outside the app.
import { client } from './db';
import { verifyChains } from './chain-verify';
import { loadEvidenceByNumber } from './evidence';

/** The pack of the job with this card number in this shop; null for any other. */
export function evidenceForJob(shopId: string, rawNumber: string) {
	return loadEvidenceByNumber(client, shopId, rawNumber);
}

/** The owner's log check (/shop/log-check): every job chain of the shop recomputed. */
export function verifyShopChains(shopId: string) {
	return verifyChains(client, shopId);
}
