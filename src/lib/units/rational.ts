/**
 * Exact rational arithmetic on BigInt, so that conversion factors are built from their
 * definitions (g_n = 9.80665, 1 lb = 0.45359237 kg, 1 in = 0.0254 m, 1 US gal = 231 in³)
 * and a value is converted with a single rounding at the end, instead of collecting float
 * error through a chain of multiplications.
 */
export interface Rational {
	readonly n: bigint;
	/** Always positive. */
	readonly d: bigint;
}

function abs(x: bigint): bigint {
	return x < 0n ? -x : x;
}

function gcd(a: bigint, b: bigint): bigint {
	a = abs(a);
	b = abs(b);
	while (b !== 0n) {
		const t = a % b;
		a = b;
		b = t;
	}
	return a;
}

export function rat(n: bigint, d: bigint = 1n): Rational {
	if (d === 0n) throw new RangeError('Rational with a zero denominator');
	if (d < 0n) {
		n = -n;
		d = -d;
	}
	const g = gcd(n, d);
	return g > 1n ? { n: n / g, d: d / g } : { n, d };
}

/**
 * A rational from a decimal string ('0.45359237', '231', '-1.5e-3'), or from a finite number
 * read as the shortest decimal that prints it (0.1 is taken as one tenth, which is what a
 * person who typed 0.1 meant).
 */
export function dec(value: string | number): Rational {
	const s = typeof value === 'number' ? String(value) : value.trim();
	const m = /^([+-]?)(\d*)(?:\.(\d*))?(?:e([+-]?\d+))?$/i.exec(s);
	if (!m || (m[2] === '' && (m[3] ?? '') === '')) {
		throw new RangeError(`Not a finite decimal number: ${s}`);
	}
	const sign = m[1] === '-' ? -1n : 1n;
	const intPart = m[2] ?? '';
	const fracPart = m[3] ?? '';
	const exp = Number(m[4] ?? '0') - fracPart.length;
	let n = BigInt((intPart + fracPart).replace(/^0+(?=\d)/, '') || '0') * sign;
	let d = 1n;
	if (exp >= 0) n *= 10n ** BigInt(exp);
	else d = 10n ** BigInt(-exp);
	return rat(n, d);
}

export function mul(a: Rational, b: Rational): Rational {
	return rat(a.n * b.n, a.d * b.d);
}

export function div(a: Rational, b: Rational): Rational {
	if (b.n === 0n) throw new RangeError('Division by zero');
	return rat(a.n * b.d, a.d * b.n);
}

export function add(a: Rational, b: Rational): Rational {
	return rat(a.n * b.d + b.n * a.d, a.d * b.d);
}

export function sub(a: Rational, b: Rational): Rational {
	return rat(a.n * b.d - b.n * a.d, a.d * b.d);
}

export function pow(a: Rational, k: number): Rational {
	let r: Rational = { n: 1n, d: 1n };
	for (let i = 0; i < k; i++) r = mul(r, a);
	return r;
}

/** The nearest double to n/d, computed from 21 significant decimal digits. */
export function toNumber(r: Rational): number {
	if (r.n === 0n) return 0;
	const neg = r.n < 0n;
	const n = abs(r.n);
	const digitsN = n.toString().length;
	const digitsD = r.d.toString().length;
	const scale = Math.max(0, 21 - (digitsN - digitsD));
	const q = (n * 10n ** BigInt(scale)) / r.d;
	const x = Number(`${q.toString()}e-${scale}`);
	return neg ? -x : x;
}
