import { describe, expect, it } from 'vitest';
import { pickByGrade } from './fluid';

// Invented demo price list; "SAE 10W-30, API SJ, JASO MA" is a valid J300/API/JASO triple
// (SAE J300, API gasoline categories, JASO T 903; the combination is common practice).
const items = [
	{ id: 'a', fluid: 'SAE 10W-30, API SJ, JASO MA' },
	{ id: 'b', fluid: 'SAE 10W-40, API SN, JASO MA2' },
	{ id: 'c', fluid: 'SAE 10W-40, API SN, JASO MB' },
	{ id: 'd', fluid: 'DOT 4' },
	{ id: 'e', fluid: null }
];

describe('a fluid billed by its logged grade', () => {
	it('the item whose grade states every logged part the same way', () => {
		expect(pickByGrade('SAE 10W-30 · API SJ · JASO MA', items).item?.id).toBe('a');
		expect(pickByGrade('SAE 10W-40 · JASO MA2', items).item?.id).toBe('b');
		expect(pickByGrade('DOT 4', items).item?.id).toBe('d');
	});

	it('JASO MA2 is not billed as MA, nor MB as MA2 (JASO T 903 classes are different oils)', () => {
		const r = pickByGrade('SAE 10W-30 · JASO MA2', items);
		expect(r.item).toBeNull();
		expect(r.problem).toMatch(/No price-list fluid has the grade SAE 10W-30 · JASO MA2/);
		expect(r.item === null && r.near.map((n) => n.id)).toEqual(['a']);
	});

	it('a grade that matches two items asks which one', () => {
		const r = pickByGrade('SAE 10W-40 · API SN', items);
		expect(r.item).toBeNull();
		expect(r.problem).toMatch(/2 price-list fluids match/);
		expect(r.item === null && r.near.map((n) => n.id)).toEqual(['b', 'c']);
	});

	it('DOT 5.1 is not billed as DOT 4 (FMVSS 116 classes)', () => {
		expect(pickByGrade('DOT 5.1', items).item).toBeNull();
	});

	it('an unreadable grade is said, not guessed', () => {
		expect(pickByGrade('SAE 15W-35', items).problem).toMatch(/cannot be read/);
		expect(pickByGrade('', items).item).toBeNull();
	});
});
