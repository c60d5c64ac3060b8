// The evidence pack of one job card for the routes; evidence.ts takes its SQL client as an
// argument so that scripts (bench:evidence) can run it outside the app.
import { client } from './db';
import { loadEvidenceByNumber } from './evidence';

/** The pack of the job with this card number in this shop; null for any other. */
export function evidenceForJob(shopId: string, rawNumber: string) {
	return loadEvidenceByNumber(client, shopId, rawNumber);
}
