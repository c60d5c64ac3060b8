import { describe, expect, it } from 'vitest';
import { isDatabaseUnavailable, isUniqueViolation } from './errors';

// Shapes as postgres.js 3.4.9 and drizzle-orm 0.45 produce them when the local PostgreSQL is
// stopped, restarting or ends a session (seen against the project's cluster); SQLSTATE codes
// from the PostgreSQL manual, appendix A.
const socket = (code: string) => Object.assign(new Error(`connect ${code}`), { code });
const postgresError = (code: string) =>
	Object.assign(new Error('server says'), { name: 'PostgresError', code });
const drizzle = (cause: unknown) => Object.assign(new Error('Failed query: select 1'), { cause });

describe('isDatabaseUnavailable', () => {
	it('is true for a refused, reset or closed connection, raw or wrapped by Drizzle', () => {
		for (const code of ['ECONNREFUSED', 'ECONNRESET', 'CONNECTION_CLOSED', 'CONNECT_TIMEOUT']) {
			expect(isDatabaseUnavailable(socket(code))).toBe(true);
			expect(isDatabaseUnavailable(drizzle(socket(code)))).toBe(true);
		}
	});

	it('is true for a server that is shutting down or starting up', () => {
		// 57P01 admin_shutdown (fast stop), 57P03 cannot_connect_now (starting up), 08006
		for (const code of ['57P01', '57P03', '08006', '53300']) {
			expect(isDatabaseUnavailable(drizzle(postgresError(code)))).toBe(true);
		}
	});

	it('looks into an AggregateError (every address refused)', () => {
		const both = new AggregateError([socket('ECONNREFUSED'), socket('ECONNREFUSED')], 'refused');
		expect(isDatabaseUnavailable(both)).toBe(true);
	});

	it('is false for faults of the request or the code', () => {
		expect(isDatabaseUnavailable(drizzle(postgresError('23505')))).toBe(false); // unique_violation
		expect(isDatabaseUnavailable(drizzle(postgresError('22P02')))).toBe(false); // bad input
		expect(isDatabaseUnavailable(new TypeError('x is undefined'))).toBe(false);
		expect(isDatabaseUnavailable(null)).toBe(false);
		expect(isDatabaseUnavailable('ECONNREFUSED')).toBe(false);
	});

	it('stops on a cause that points back at itself', () => {
		const loop: { code: string; cause?: unknown } = { code: 'XX000' };
		loop.cause = loop;
		expect(isDatabaseUnavailable(loop)).toBe(false);
	});
});

describe('isUniqueViolation', () => {
	it('is true for 23505 raw or wrapped', () => {
		expect(isUniqueViolation(postgresError('23505'))).toBe(true);
		expect(isUniqueViolation(drizzle(postgresError('23505')))).toBe(true);
		expect(isUniqueViolation(drizzle(postgresError('23503')))).toBe(false);
	});
});
