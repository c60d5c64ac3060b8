// VINs and registrations. A VIN is checked, never refused: ISO 3779 fixes 17 characters without
// I, O and Q, and the ninth is a check digit only where North American rules apply (49 CFR
// 565.15); older frames and many other markets use that place for something else.

const TRANSLIT: Record<string, number> = {
	A: 1,
	B: 2,
	C: 3,
	D: 4,
	E: 5,
	F: 6,
	G: 7,
	H: 8,
	J: 1,
	K: 2,
	L: 3,
	M: 4,
	N: 5,
	P: 7,
	R: 9,
	S: 2,
	T: 3,
	U: 4,
	V: 5,
	W: 6,
	X: 7,
	Y: 8,
	Z: 9
};
const WEIGHTS = [8, 7, 6, 5, 4, 3, 2, 10, 0, 9, 8, 7, 6, 5, 4, 3, 2];

/** Upper case, without spaces, dashes or dots (as people copy a VIN off a frame or a form). */
export function normalizeVin(raw: string): string {
	return raw.toUpperCase().replace(/[\s.-]/g, '');
}

/** The North American check digit of a 17-character VIN ('0'–'9' or 'X'); null if unreadable. */
export function vinCheckDigit(vin: string): string | null {
	if (!/^[A-HJ-NPR-Z0-9]{17}$/.test(vin)) return null;
	let sum = 0;
	for (let i = 0; i < 17; i++) {
		const c = vin[i];
		const n = /\d/.test(c) ? Number(c) : TRANSLIT[c];
		sum += n * WEIGHTS[i];
	}
	const r = sum % 11;
	return r === 10 ? 'X' : String(r);
}

export interface VinCheck {
	vin: string;
	/** Words for the service writer; empty when nothing looks wrong. */
	warnings: string[];
}

/** Checks a VIN and explains what looks wrong; the VIN is kept whatever the answer. */
export function checkVin(raw: string): VinCheck {
	const vin = normalizeVin(raw);
	const warnings: string[] = [];
	if (vin === '') return { vin, warnings };
	if (/[IOQ]/.test(vin)) {
		warnings.push('A VIN never uses the letters I, O or Q (ISO 3779): check for 1 and 0.');
	}
	if (!/^[A-Z0-9]*$/.test(vin)) warnings.push('A VIN holds only letters and digits.');
	if (vin.length !== 17) {
		warnings.push(
			`A VIN has 17 characters; this has ${vin.length}. Older frames may carry a shorter number.`
		);
	} else if (warnings.length === 0) {
		const expected = vinCheckDigit(vin);
		if (expected !== null && vin[8] !== expected) {
			warnings.push(
				`The check digit (9th character) should be ${expected} under North American rules. ` +
					'Vehicles made for other markets often differ: compare it with the frame.'
			);
		}
	}
	return { vin, warnings };
}

/** A registration as searched: upper case, spaces and dashes ignored ("ab 12 cde" = "AB12CDE"). */
export function normalizeRegistration(raw: string): string {
	return raw.toUpperCase().replace(/[\s-]/g, '');
}

/**
 * A timestamp as the database client hands it over: drizzle makes postgres.js pass timestamps
 * through as PostgreSQL's text ("2026-12-04 05:00:00.123456+00"), so raw queries read Dates here.
 */
export function toDate(v: unknown): Date {
	if (v instanceof Date) return v;
	return new Date(
		String(v)
			.replace(' ', 'T')
			.replace(/([+-]\d\d)$/, '$1:00')
	);
}
