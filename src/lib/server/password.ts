// Password hashing: argon2id with the OWASP-recommended minimum parameters.
// No framework imports: the seed script uses it too.
import { hash, verify } from '@node-rs/argon2';

const options = { memoryCost: 19456, timeCost: 2, outputLen: 32, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
	return hash(password, options);
}

/** False for a wrong password or a malformed hash; never throws. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
	try {
		return await verify(passwordHash, password, options);
	} catch {
		return false;
	}
}

/** A hash of a random secret, verified against when the e-mail is unknown, so timing says nothing. */
let dummy: Promise<string> | null = null;
export function dummyHash(): Promise<string> {
	dummy ??= hashPassword(crypto.randomUUID());
	return dummy;
}
