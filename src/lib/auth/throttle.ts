// Sign-in throttling rules. Pure: the server counts recent failures and asks here.

export const throttleWindowMinutes = 15;
/**
 * Failures for one e-mail from one address within the window before further tries from there
 * are refused. Counted per e-mail and address, so nobody elsewhere can lock an account out.
 */
export const maxFailuresPerEmail = 5;
/** Failures for one e-mail from any address: the slower, global back-off. */
export const maxFailuresPerEmailAnywhere = 50;
/** From this many failures for an e-mail from anywhere, every answer waits the longest delay. */
export const slowFailuresPerEmailAnywhere = 10;
/** Failures from one address within the window (many e-mails) before it is refused. */
export const maxFailuresPerAddress = 20;

export interface FailureCounts {
	/** Failures for this e-mail from this address. */
	email: number;
	/** Failures for this e-mail from any address (absent: counted as `email`). */
	emailAnywhere?: number;
	oldestEmailAnywhereFailure?: Date | null;
	address: number;
	/** The oldest failure still inside the window, for the one that blocks. */
	oldestEmailFailure: Date | null;
	oldestAddressFailure: Date | null;
}

export type ThrottleDecision =
	| { allowed: true; delayMs: number }
	| { allowed: false; retryAfterSeconds: number; message: string };

/**
 * Decides whether a sign-in attempt may be checked at all, and how long to wait before
 * answering. From the third failure on each answer is slowed by a second more (up to 3 s).
 */
export function decide(counts: FailureCounts, now: Date): ThrottleDecision {
	const windowMs = throttleWindowMinutes * 60_000;
	const blocked = (oldest: Date | null) => {
		const until = (oldest?.getTime() ?? now.getTime()) + windowMs;
		return Math.max(1, Math.ceil((until - now.getTime()) / 1000));
	};
	if (counts.email >= maxFailuresPerEmail) {
		const retryAfterSeconds = blocked(counts.oldestEmailFailure);
		return {
			allowed: false,
			retryAfterSeconds,
			message: `Too many failed sign-ins for this e-mail. Sign-in is paused for it: try again in ${minutes(retryAfterSeconds)}.`
		};
	}
	const anywhere = counts.emailAnywhere ?? counts.email;
	if (anywhere >= maxFailuresPerEmailAnywhere) {
		const retryAfterSeconds = blocked(counts.oldestEmailAnywhereFailure ?? null);
		return {
			allowed: false,
			retryAfterSeconds,
			message: `Too many failed sign-ins for this e-mail. Sign-in is paused for it: try again in ${minutes(retryAfterSeconds)}.`
		};
	}
	if (counts.address >= maxFailuresPerAddress) {
		const retryAfterSeconds = blocked(counts.oldestAddressFailure);
		return {
			allowed: false,
			retryAfterSeconds,
			message: `Too many failed sign-ins from this device. Try again in ${minutes(retryAfterSeconds)}.`
		};
	}
	const failures = Math.max(counts.email, 0);
	if (anywhere >= slowFailuresPerEmailAnywhere) return { allowed: true, delayMs: 3000 };
	return { allowed: true, delayMs: failures >= 2 ? Math.min(3000, (failures - 1) * 1000) : 0 };
}

function minutes(seconds: number): string {
	const m = Math.ceil(seconds / 60);
	return m <= 1 ? 'a minute' : `${m} minutes`;
}
