import { describe, expect, it } from 'vitest';
import {
	EntryQueue,
	backoffMs,
	outcomeOfStatus,
	type NewEntry,
	type QueuedEntry,
	type QueueStorage,
	type SendOutcome
} from './queue';

function memoryStorage(initial?: QueuedEntry[]) {
	let saved: QueuedEntry[] | undefined = initial ? structuredClone(initial) : undefined;
	const storage: QueueStorage & { saved: () => QueuedEntry[] | undefined } = {
		load: async () => (saved ? structuredClone(saved) : undefined),
		save: async (entries) => {
			saved = structuredClone(entries);
		},
		saved: () => saved
	};
	return storage;
}

const entry = (id: string, text = 'rear axle 80 nm'): NewEntry => ({
	id,
	jobId: 'job-1',
	text,
	source: 'typed',
	occurredAt: '2026-12-02T09:00:00.000Z'
});

describe('backoffMs', () => {
	it('doubles from one second and stops at thirty', () => {
		expect([0, 1, 2, 3, 4, 5, 6, 7, 50].map(backoffMs)).toEqual([
			0, 1000, 2000, 4000, 8000, 16000, 30000, 30000, 30000
		]);
	});
});

describe('outcomeOfStatus', () => {
	it('acknowledges 2xx, retries what may pass later and refuses the rest', () => {
		expect(outcomeOfStatus(201, '').kind).toBe('ack');
		expect(outcomeOfStatus(200, '').kind).toBe('ack');
		for (const s of [0, 401, 408, 429, 500, 503])
			expect(outcomeOfStatus(s, 'x').kind).toBe('retry');
		for (const s of [400, 403, 404, 409, 422]) {
			expect(outcomeOfStatus(s, 'x').kind).toBe('rejected');
		}
	});
});

describe('EntryQueue', () => {
	it('stores an entry before sending it and removes it once acknowledged', async () => {
		const storage = memoryStorage();
		const seenStored: number[] = [];
		const q = new EntryQueue({
			storage,
			send: async () => {
				seenStored.push(storage.saved()?.length ?? 0);
				return { kind: 'ack' };
			}
		});
		await q.init();
		await q.enqueue(entry('a'));
		expect(storage.saved()?.map((e) => e.id)).toEqual(['a']);
		await q.flush();
		expect(seenStored).toEqual([1]);
		expect(q.waiting).toEqual([]);
		expect(storage.saved()).toEqual([]);
	});

	it('keeps a failed entry with growing back-off and does not try before it is due', async () => {
		let t = 1_000_000;
		const storage = memoryStorage();
		let calls = 0;
		const q = new EntryQueue({
			storage,
			now: () => t,
			send: async () => {
				calls++;
				return { kind: 'retry', message: 'offline' };
			}
		});
		await q.enqueue(entry('a'));
		await q.flush();
		expect(q.waiting[0]).toMatchObject({ attempts: 1, notBefore: t + 1000, lastError: 'offline' });
		await q.flush();
		expect(calls).toBe(1);
		t += 1000;
		await q.flush();
		expect(calls).toBe(2);
		expect(q.waiting[0]).toMatchObject({ attempts: 2, notBefore: t + 2000 });
		q.resetBackoff();
		await q.flush();
		expect(calls).toBe(3);
	});

	it('treats a thrown send as a retry', async () => {
		const q = new EntryQueue({
			storage: memoryStorage(),
			send: async () => {
				throw new TypeError('Failed to fetch');
			}
		});
		await q.enqueue(entry('a'));
		await q.flush();
		expect(q.waiting).toHaveLength(1);
		expect(q.waiting[0].lastError).toBe('Failed to fetch');
	});

	it('sends in order and stops at the first entry that must wait', async () => {
		const sent: string[] = [];
		let online = false;
		const q = new EntryQueue({
			storage: memoryStorage(),
			now: () => 0,
			send: async (e): Promise<SendOutcome> => {
				if (!online) return { kind: 'retry', message: 'offline' };
				sent.push(e.id);
				return { kind: 'ack' };
			}
		});
		await q.enqueue(entry('a'));
		await q.enqueue(entry('b'));
		await q.enqueue(entry('c', 'undo'));
		await q.flush();
		expect(sent).toEqual([]);
		expect(q.waiting.map((e) => e.id)).toEqual(['a', 'b', 'c']);
		online = true;
		q.resetBackoff();
		await q.flush();
		expect(sent).toEqual(['a', 'b', 'c']);
	});

	it('keeps a refused entry on the device with its reason, reports it and goes on', async () => {
		const settled: [string, string][] = [];
		const storage = memoryStorage();
		const q = new EntryQueue({
			storage,
			send: async (e) =>
				e.id === 'bad'
					? { kind: 'rejected', message: 'This job is not assigned to you.' }
					: { kind: 'ack' },
			onSettled: (e, o) => settled.push([e.id, o.kind])
		});
		await q.enqueue(entry('bad'));
		await q.enqueue(entry('good'));
		await q.flush();
		expect(settled).toEqual([
			['bad', 'rejected'],
			['good', 'ack']
		]);
		expect(q.waiting.map((e) => [e.id, e.refused])).toEqual([
			['bad', 'This job is not assigned to you.']
		]);
		// kept in storage too: a reload still shows it
		expect(storage.saved()?.map((e) => e.id)).toEqual(['bad']);
		// a refused entry is not sent again by itself, and blocks nothing behind it
		await q.enqueue(entry('later'));
		await q.flush();
		expect(settled.map(([id]) => id)).toEqual(['bad', 'good', 'later']);
		expect(q.nextAttemptAt()).toBeNull();
	});

	it('sends a refused entry again only when asked, with its own id and time', async () => {
		const sent: QueuedEntry[] = [];
		let refuse = true;
		const q = new EntryQueue({
			storage: memoryStorage(),
			send: async (e) => {
				sent.push(e);
				return refuse ? { kind: 'rejected', message: 'Not yours.' } : { kind: 'ack' };
			}
		});
		await q.enqueue(entry('a'));
		await q.flush();
		await q.flush();
		expect(sent).toHaveLength(1);
		refuse = false;
		await q.sendAgain('a');
		expect(q.waiting[0].refused).toBeUndefined();
		await q.flush();
		expect(sent.map((e) => [e.id, e.occurredAt])).toEqual([
			['a', '2026-12-02T09:00:00.000Z'],
			['a', '2026-12-02T09:00:00.000Z']
		]);
		expect(q.waiting).toEqual([]);
	});

	it('removes by hand only an entry the server refused', async () => {
		const q = new EntryQueue({
			storage: memoryStorage(),
			send: async (e) =>
				e.id === 'bad'
					? { kind: 'rejected', message: 'No.' }
					: { kind: 'retry', message: 'offline', status: 0 }
		});
		await q.enqueue(entry('bad'));
		await q.enqueue(entry('waits'));
		await q.flush();
		await q.remove('waits');
		expect(q.waiting.map((e) => e.id)).toEqual(['bad', 'waits']);
		expect(q.waiting[1].lastStatus).toBe(0);
		await q.remove('bad');
		expect(q.waiting.map((e) => e.id)).toEqual(['waits']);
	});

	it('survives a reload: a new queue on the same storage sends what was waiting, once', async () => {
		const storage = memoryStorage();
		const first = new EntryQueue({
			storage,
			send: async () => ({ kind: 'retry', message: 'offline' })
		});
		await first.enqueue(entry('a'));
		await first.enqueue(entry('b'));
		await first.flush();

		const sent: string[] = [];
		const counts: number[] = [];
		const second = new EntryQueue({
			storage,
			now: () => Number.MAX_SAFE_INTEGER,
			send: async (e) => {
				sent.push(e.id);
				return { kind: 'ack' };
			},
			onChange: (w) => counts.push(w.length)
		});
		// a new entry made before the stored ones were read must not overwrite them
		await second.enqueue(entry('c'));
		await second.enqueue(entry('a'));
		await second.flush();
		expect(sent).toEqual(['a', 'b', 'c']);
		expect(counts[0]).toBe(2);
		expect(storage.saved()).toEqual([]);
	});

	it('shares one run between concurrent flushes, so nothing is sent twice', async () => {
		const sent: string[] = [];
		const q = new EntryQueue({
			storage: memoryStorage(),
			send: async (e) => {
				sent.push(e.id);
				await new Promise((r) => setTimeout(r, 1));
				return { kind: 'ack' };
			}
		});
		await q.enqueue(entry('a'));
		await q.enqueue(entry('b'));
		await Promise.all([q.flush(), q.flush(), q.flush()]);
		expect(sent).toEqual(['a', 'b']);
	});

	it('ignores stored rubbish', async () => {
		const storage = memoryStorage([{ nope: true } as unknown as QueuedEntry]);
		const q = new EntryQueue({ storage, send: async () => ({ kind: 'ack' }) });
		await q.init();
		expect(q.waiting).toEqual([]);
	});
});
