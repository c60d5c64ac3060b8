// log_entry.seq counts per shop (drizzle/0015): the live feed, paging and the queue read a
// shop's log in seq order, so within a shop seqs must be unique and rise as entries are chained,
// whether they arrive in one group-commit statement, alone, or from several connections at once.
import postgres from 'postgres';
import { afterAll, describe, expect, it } from 'vitest';
import { client } from '../db';
import { makeShop } from '../db/fixtures';
import { answerStatus } from '../http';
import { appendEntry } from './append';

type Fixture = Awaited<ReturnType<typeof makeShop>>;

const others = postgres(process.env.DATABASE_URL!, { max: 6, onnotice: () => {} });
afterAll(() => others.end({ timeout: 2 }));

async function seqs(f: Fixture) {
	return client<{ seq: string; chain_pos: number; id: string }[]>`
		select seq, chain_pos, id from log_entry where shop_id = ${f.shop.id} order by chain_pos`;
}

describe('the per-shop seq', () => {
	it('starts at 1 in each shop and rises with the chain, appends arriving together or alone', async () => {
		const a = await makeShop('Seq A');
		const b = await makeShop('Seq B');
		const actor = (f: Fixture) => ({
			id: f.tech.id,
			shopId: f.shop.id,
			role: 'technician' as const
		});
		// Both shops at once, through the group commit (one statement for the batch).
		const posts = (n: number) =>
			Array.from({ length: n }, (_, i) => ({
				id: crypto.randomUUID(),
				text: `rear axle ${80 + (i % 10)} nm`,
				source: 'typed' as const
			}));
		const pa = posts(20);
		const pb = posts(12);
		const results = await Promise.all([
			...pa.map((p) => appendEntry(actor(a), a.job.id, p)),
			...pb.map((p) => appendEntry(actor(b), b.job.id, p))
		]);
		expect(results.every((r) => answerStatus(r) === 201)).toBe(true);
		// A resend stores nothing and takes no seq of its own.
		expect(answerStatus(await appendEntry(actor(a), a.job.id, pa[0]))).toBe(200);
		for (const [f, n] of [
			[a, 20],
			[b, 12]
		] as const) {
			const rows = await seqs(f);
			expect(rows.map((r) => Number(r.seq))).toEqual(Array.from({ length: n }, (_, i) => i + 1));
		}
	});

	it('stays unique and in chain order when several connections append to one job at once', async () => {
		const f = await makeShop('Seq race');
		const insert = (sql: postgres.Sql, n: number) => sql`
			insert into log_entry (id, shop_id, job_id, job_step_id, author_id, kind, raw_text, source,
				occurred_at)
			select gen_random_uuid(), ${f.shop.id}, ${f.job.id}, ${f.step.id}, ${f.tech.id}, 'note',
				'note race ' || g, 'typed', now()
			from generate_series(1, ${n}) g`;
		// Twelve multi-row statements over six connections, as six servers' group commits would be.
		await Promise.all(Array.from({ length: 12 }, () => insert(others, 25)));
		const rows = await seqs(f);
		expect(rows).toHaveLength(300);
		const s = rows.map((r) => Number(r.seq));
		expect(new Set(s).size).toBe(300);
		// Ordered by the chain, the seqs rise: a reader paging by seq reads the job's chain order.
		expect(s).toEqual([...s].sort((x, y) => x - y));
	});

	it('sets the seq itself, whatever the insert says', async () => {
		const f = await makeShop('Seq key');
		const [row] = await client`
			insert into log_entry (id, shop_id, job_id, author_id, kind, raw_text, source, occurred_at)
			values (gen_random_uuid(), ${f.shop.id}, ${f.job.id}, ${f.tech.id}, 'note', 'one', 'typed', now())
			returning seq`;
		expect(Number(row.seq)).toBe(1);
		// The trigger sets seq whatever the statement says: nothing writes a seq of its own.
		const [next] = await client`
			insert into log_entry (id, shop_id, job_id, author_id, kind, raw_text, source, occurred_at, seq)
			values (gen_random_uuid(), ${f.shop.id}, ${f.job.id}, ${f.tech.id}, 'note', 'two', 'typed', now(), 1)
			returning seq`;
		expect(Number(next.seq)).toBe(2);
	});
});
