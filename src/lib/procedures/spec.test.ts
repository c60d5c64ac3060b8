import { describe, expect, it } from 'vitest';
import { describeSpec, plusMinusOf, specLabel, toStoredSpec } from './spec';

describe('toStoredSpec', () => {
	it('turns nominal ± tolerance into min and max', () => {
		// common practice: a spec written "24 ± 2 N·m" means 22 to 26 N·m
		expect(toStoredSpec({ nominal: 24, plusMinus: 2 })).toEqual({
			ok: true,
			nominal: 24,
			min: 22,
			max: 26
		});
	});

	it('leaves no binary noise in decimal tolerances', () => {
		expect(toStoredSpec({ nominal: 1.1, plusMinus: 0.05 })).toEqual({
			ok: true,
			nominal: 1.1,
			min: 1.05,
			max: 1.15
		});
		expect(toStoredSpec({ nominal: 24, plusMinus: 2.2 })).toMatchObject({ min: 21.8, max: 26.2 });
	});

	it('keeps min and max as given, and a nominal alone as nominal-only', () => {
		expect(toStoredSpec({ nominal: 80, min: 78, max: 96 })).toEqual({
			ok: true,
			nominal: 80,
			min: 78,
			max: 96
		});
		expect(toStoredSpec({ nominal: 10 })).toEqual({ ok: true, nominal: 10, min: null, max: null });
		expect(toStoredSpec({ min: 20 })).toEqual({ ok: true, nominal: null, min: 20, max: null });
		expect(toStoredSpec({})).toEqual({ ok: true, nominal: null, min: null, max: null });
	});

	it('refuses contradictions, naming the field', () => {
		expect(toStoredSpec({ nominal: 10, min: 9, plusMinus: 1 })).toMatchObject({
			ok: false,
			field: 'plusMinus'
		});
		expect(toStoredSpec({ plusMinus: 1 })).toMatchObject({ ok: false, field: 'nominal' });
		expect(toStoredSpec({ nominal: 10, plusMinus: 0 })).toMatchObject({
			ok: false,
			field: 'plusMinus'
		});
		expect(toStoredSpec({ min: 30, max: 20 })).toMatchObject({ ok: false, field: 'max' });
		expect(toStoredSpec({ nominal: 5, min: 9, max: 11 })).toMatchObject({
			ok: false,
			field: 'nominal',
			message: 'The nominal value is below min.'
		});
		expect(toStoredSpec({ nominal: Number.NaN })).toMatchObject({ ok: false, field: 'nominal' });
	});

	it('reads a symmetric tolerance back for the editor', () => {
		expect(plusMinusOf({ nominal: 24, min: 22, max: 26 })).toBe(2);
		expect(plusMinusOf({ nominal: 1.1, min: 1.05, max: 1.15 })).toBe(0.05);
		expect(plusMinusOf({ nominal: 80, min: 78, max: 96 })).toBeNull();
		expect(plusMinusOf({ nominal: 10, min: null, max: null })).toBeNull();
	});
});

describe('describeSpec', () => {
	const fmt = (n: number) => String(n);
	const sym = (c: string) => (c === 'N.m' ? 'N·m' : c);
	it('reads a spec the way the trade writes it', () => {
		expect(describeSpec({ nominal: 24, min: 22, max: 26, unit: 'N.m' }, fmt, sym)).toBe(
			'22–26 N·m (nominal 24)'
		);
		expect(describeSpec({ nominal: 1.1, min: null, max: null, unit: 'L' }, fmt, sym)).toBe('1.1 L');
		expect(describeSpec({ nominal: null, min: 20, max: null, unit: 'mm' }, fmt, sym)).toBe(
			'≥ 20 mm'
		);
		expect(describeSpec({ nominal: null, min: null, max: null, unit: null }, fmt, sym)).toBe('—');
	});
});

describe('specLabel', () => {
	it('writes a spec with the trade’s unit symbols', () => {
		// kgf·m and lbf·ft are the trade's symbols for UCUM kgf.m and [lbf_av].[ft_i] (UCUM)
		expect(specLabel({ nominal: 3.3, min: 3, max: 3.6, unit: 'kgf.m' })).toBe(
			'3–3.6 kgf·m (nominal 3.3)'
		);
		expect(specLabel({ nominal: null, min: 18, max: 22, unit: '[lbf_av].[ft_i]' })).toBe(
			'18–22 lbf·ft'
		);
	});
});
