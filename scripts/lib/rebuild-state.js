// Rebuilds the state derived from the job log (job_step_state, job_log_state, drift_reading;
// drizzle/0011, 0017) of every shop, or of one, from the log itself, one shop per transaction.
// The log is the truth: this is safe at any time, and is what to run after loading a log by
// other means (a restore with triggers off, a bulk import).
import postgres from 'postgres';

/** @param {string} url @param {string | null} shopId */
export async function rebuildState(url, shopId = null) {
	const client = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const shops = shopId
			? await client`select id, name from shop where id = ${shopId}`
			: await client`select id, name from shop order by name`;
		if (shopId && shops.length === 0) throw new Error(`No shop with id ${shopId}.`);
		for (const shop of shops) {
			const t = performance.now();
			await client.begin((tx) => tx`select rebuild_log_state(${shop.id})`);
			console.log(`  ${shop.name}: rebuilt in ${((performance.now() - t) / 1000).toFixed(1)} s`);
		}
		return shops.length;
	} finally {
		await client.end();
	}
}
