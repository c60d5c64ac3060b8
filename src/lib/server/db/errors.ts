/** True for PostgreSQL's unique_violation (23505), whether raw or wrapped by Drizzle. */
export function isUniqueViolation(e: unknown): boolean {
	const err = e as { code?: string; cause?: { code?: string } } | null;
	return err?.code === '23505' || err?.cause?.code === '23505';
}
