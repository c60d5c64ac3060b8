// Direct reads of the test database for the Bench's end-to-end checks ("the row is stored").
import postgres from 'postgres';

let sql: postgres.Sql | null = null;

export function db(): postgres.Sql {
	const url = process.env.BENCHCALL_TEST_DATABASE_URL;
	if (!url) throw new Error('BENCHCALL_TEST_DATABASE_URL is not set (run through npm test).');
	sql ??= postgres(url, { max: 2 });
	return sql;
}

export async function jobId(number: number, shopName = 'Kettle Street'): Promise<string> {
	const [row] = await db()`
		select j.id from job j join shop s on s.id = j.shop_id
		where j.number = ${number} and s.name like ${shopName + '%'}`;
	if (!row) throw new Error(`no job ${number}`);
	return row.id as string;
}

export async function entry(id: string) {
	const [row] = await db()`select * from log_entry where id = ${id}`;
	return row ?? null;
}
