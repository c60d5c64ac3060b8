import { describe, expect, it } from 'vitest';
import { makeShop } from './db/fixtures';
import type { Actor } from './bench/job';
import { appendEntry, type AppendResult } from './log/append';
import { subscribe, type LiveEvent } from './live';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

/** Appends through the app's own path, which announces the entry after its commit. */
async function log(f: Fixture, text: string) {
	const actor: Actor = { id: f.tech.id, shopId: f.shop.id, role: 'technician' };
	const r: AppendResult = await appendEntry(actor, f.job.id, {
		id: crypto.randomUUID(),
		text,
		source: 'typed'
	});
	if (!('entry' in r)) throw new Error(`not stored: ${JSON.stringify(r)}`);
	return r.entry;
}

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
	// First in this file: the first subscription is what opens this module's listening connection.
	it('tells subscribers that came before the listening connection was up to catch up', async () => {
		const a = await makeShop('Live early');
		let resyncs = 0;
		// A stream reads its catch-up right after subscribing; on a freshly started server that read
		// runs before LISTEN is active, and an entry committed in between is announced to no one.
		const off = subscribe(
			a.shop.id,
			() => {},
			() => resyncs++
		);
		try {
			const started = Date.now();
			while (resyncs === 0 && Date.now() - started < 5000)
				await new Promise((r) => setTimeout(r, 20));
			expect(resyncs).toBe(1);
		} finally {
			off();
		}
	});

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
			const entry = await log(a, 'rear axle 82 nm');
			await waitFor(gotA, 1);
			expect(gotA[0]).toEqual({
				seq: entry.seq,
				id: entry.id,
				shopId: a.shop.id,
				jobId: a.job.id,
				kind: 'measure'
			});
			// A retraction is announced too, in order after the entry it withdraws.
			const undo = await log(a, 'undo');
			await waitFor(gotA, 2);
			expect(gotA[1]).toMatchObject({ id: undo.id, seq: undo.seq, kind: 'retraction' });
			expect(undo.seq).toBeGreaterThan(entry.seq);
			expect(gotB).toEqual([]);
		} finally {
			offA();
			offB();
		}
		// A subscriber that stays tells when the next entry has been fanned out: by then the one
		// that left would have had it too, had leaving not worked.
		const stayed: LiveEvent[] = [];
		const offStayed = subscribe(a.shop.id, (e) => stayed.push(e));
		try {
			const after = await log(a, 'rear axle 83 nm');
			await waitFor(stayed, 1);
			expect(stayed[0].id).toBe(after.id);
			expect(gotA.map((e) => e.id)).not.toContain(after.id);
		} finally {
			offStayed();
		}
	});
});
