/** True for PostgreSQL's unique_violation (23505), whether raw or wrapped by Drizzle. */
export function isUniqueViolation(e: unknown): boolean {
	const err = e as { code?: string; cause?: { code?: string } } | null;
	return err?.code === '23505' || err?.cause?.code === '23505';
}

/** Socket failures and the driver's own codes for a connection that is gone or never came. */
const lostConnection = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'CONNECTION_CLOSED',
	'CONNECTION_ENDED',
	'CONNECTION_DESTROYED',
	'CONNECT_TIMEOUT'
]);

/**
 * SQLSTATEs that say the server is stopping, starting or out of connections (PostgreSQL
 * appendix A: class 08 connection exception; 57P01 admin_shutdown, 57P02 crash_shutdown,
 * 57P03 cannot_connect_now; 53300 too_many_connections).
 */
function unavailableState(code: string): boolean {
	return (
		code.startsWith('08') ||
		code === '57P01' ||
		code === '57P02' ||
		code === '57P03' ||
		code === '53300'
	);
}

/**
 * True when an error means the database cannot be reached right now (restarting, stopped,
 * connection lost) rather than a fault in the request: the caller should answer 503 and ask the
 * client to try again. Looks through Drizzle's wrapper (`cause`) and an AggregateError's list.
 */
export function isDatabaseUnavailable(e: unknown, depth = 0): boolean {
	if (!e || typeof e !== 'object' || depth > 4) return false;
	const err = e as { code?: unknown; cause?: unknown; errors?: unknown };
	if (typeof err.code === 'string' && (lostConnection.has(err.code) || unavailableState(err.code)))
		return true;
	if (Array.isArray(err.errors) && err.errors.some((x) => isDatabaseUnavailable(x, depth + 1)))
		return true;
	return isDatabaseUnavailable(err.cause, depth + 1);
}

/**
 * True for drizzle/0013's refusal of an entry or photo on a job whose record is closed
 * (SQLSTATE BC409), raw or wrapped by Drizzle: a close won a race with the write.
 */
export function isClosedRecord(e: unknown): boolean {
	const err = e as { code?: string; cause?: { code?: string } } | null;
	return err?.code === 'BC409' || err?.cause?.code === 'BC409';
}
