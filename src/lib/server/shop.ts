import { eq } from 'drizzle-orm';
import { db } from './db';
import { shop } from './db/schema';

export async function getShop(shopId: string) {
	const [row] = await db.select().from(shop).where(eq(shop.id, shopId)).limit(1);
	return row ?? null;
}
