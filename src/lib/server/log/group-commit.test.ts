import { describe, expect, it } from 'vitest';
import { GroupCommit } from './group-commit';

type Row = { id: string; n: number };

/** A group commit whose flushes run only when the test says so. */
function manual(write: (rows: Row[]) => Promise<Map<string, number>>, limit = 200) {
	const flushes: (() => void)[] = [];
	const calls: string[][] = [];
	const gc = new GroupCommit<Row, number>(
		(rows) => {
			calls.push(rows.map((r) => r.id));
			return write(rows);
		},
		{ limit, schedule: (flush) => flushes.push(flush), failsAll: (e) => e === 'away' }
	);
	const flush = async () => {
		flushes.shift()?.();
		// let the write settle and the next flush be scheduled
		await new Promise((r) => setImmediate(r));
	};
	return { gc, calls, flushes, flush };
}

const doubled = async (rows: Row[]) => new Map(rows.map((r) => [r.id, r.n * 2]));

describe('GroupCommit', () => {
	it('writes the rows of one moment in one call and answers each with its own result', async () => {
		const { gc, calls, flush } = manual(doubled);
		const a = gc.add({ id: 'a', n: 1 });
		const b = gc.add({ id: 'b', n: 2 });
		await flush();
		expect(await Promise.all([a, b])).toEqual([2, 4]);
		expect(calls).toEqual([['a', 'b']]);
	});

	it('keeps at most `limit` rows per call, the rest go next', async () => {
		const { gc, calls, flush } = manual(doubled, 2);
		const all = ['a', 'b', 'c'].map((id, n) => gc.add({ id, n }));
		await flush();
		await flush();
		expect(await Promise.all(all)).toEqual([0, 2, 4]);
		expect(calls).toEqual([['a', 'b'], ['c']]);
	});

	it('gathers the next batch while one is on its way', async () => {
		let release!: () => void;
		const slow = (rows: Row[]) =>
			new Promise<Map<string, number>>(
				(r) => (release = () => r(new Map(rows.map((x) => [x.id, x.n]))))
			);
		const { gc, calls, flushes, flush } = manual(slow);
		const a = gc.add({ id: 'a', n: 1 });
		await flush();
		const b = gc.add({ id: 'b', n: 2 });
		const c = gc.add({ id: 'c', n: 3 });
		expect(flushes).toHaveLength(0); // nothing scheduled while writing
		release();
		await a;
		await new Promise((r) => setImmediate(r));
		await flush();
		release();
		expect(await Promise.all([b, c])).toEqual([2, 3]);
		expect(calls).toEqual([['a'], ['b', 'c']]);
	});

	it('sends a repeated id of the same batch alone (null) and a row not stored as null', async () => {
		const { gc, flush } = manual(async (rows) => new Map([[rows[0].id, 7]]));
		const first = gc.add({ id: 'a', n: 1 });
		const repeat = gc.add({ id: 'a', n: 1 });
		const other = gc.add({ id: 'b', n: 1 });
		await flush();
		expect(await Promise.all([first, repeat, other])).toEqual([7, null, null]);
	});

	it('answers null to every row when the statement fails, and rejects all when the database is away', async () => {
		const failing = manual(async () => {
			throw new Error('bad row');
		});
		const x = failing.gc.add({ id: 'x', n: 1 });
		const y = failing.gc.add({ id: 'y', n: 1 });
		await failing.flush();
		expect(await Promise.all([x, y])).toEqual([null, null]);

		const away = manual(async () => {
			throw 'away';
		});
		const z = expect(away.gc.add({ id: 'z', n: 1 })).rejects.toBe('away');
		await away.flush();
		await z;
	});
});
