import { describe, expect, it } from 'vitest';
import { logMeasurement, makeShop } from './db/fixtures';
import { subscribe, type LiveEvent } from './live';

function waitFor(events: LiveEvent[], n: number, ms = 5000) {
	return new Promise<void>((resolve, reject) => {
		const started = Date.now();
		const poll = setInterval(() => {
			if (events.length >= n) {
				clearInterval(poll);
				resolve();
			} else if (Date.now() - started > ms) {
				clearInterval(poll);
				reject(new Error(`got ${events.length} of ${n} events`));
			}
		}, 20);
	});
}

describe('live hub', () => {
	it("announces a committed entry to its own shop's subscribers only", async () => {
		const a = await makeShop('Live A');
		const b = await makeShop('Live B');
		const gotA: LiveEvent[] = [];
		const gotB: LiveEvent[] = [];
		const offA = subscribe(a.shop.id, (e) => gotA.push(e));
		const offB = subscribe(b.shop.id, (e) => gotB.push(e));
		try {
			// The first subscription opens the listening connection; give it a moment.
			await new Promise((r) => setTimeout(r, 300));
			const entry = await logMeasurement(a, 82, 'in');
			await waitFor(gotA, 1);
			expect(gotA[0]).toEqual({
				seq: entry.seq,
				id: entry.id,
				shopId: a.shop.id,
				jobId: a.job.id,
				kind: 'measure'
			});
			expect(gotB).toEqual([]);
		} finally {
			offA();
			offB();
		}
		const after = await logMeasurement(a, 83, 'in');
		await new Promise((r) => setTimeout(r, 300));
		expect(gotA.map((e) => e.id)).not.toContain(after.id);
	});
});
