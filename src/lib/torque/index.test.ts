import { describe, expect, it } from 'vitest';
import { addMonths, calibrationDue } from './index';

describe('calibration due', () => {
	it('12 months by default (tool-maker guidance)', () => {
		const s = calibrationDue('2026-01-15', { today: '2026-12-02' });
		expect(s.dueDate).toBe('2027-01-15');
		expect(s.state).toBe('ok');
		expect(s.daysLeft).toBe(44);
	});

	it('due soon within 30 days, overdue after the due date', () => {
		// the 30-day warning is Benchcall's own choice, not a standard
		expect(calibrationDue('2025-12-20', { today: '2026-12-02' }).state).toBe('due_soon');
		const late = calibrationDue('2025-11-30', { today: '2026-12-02' });
		expect(late.state).toBe('overdue');
		expect(late.daysLeft).toBe(-2);
		expect(late.reason).toBe('date');
		expect(calibrationDue('2025-12-02', { today: '2026-12-02' }).state).toBe('due_soon');
	});

	it('5000 cycles, whichever comes first', () => {
		// 12 months or 5 000 cycles (tool-maker guidance, whichever comes first)
		const s = calibrationDue('2026-06-01', { today: '2026-12-02', cyclesUsed: 5000 });
		expect(s.state).toBe('overdue');
		expect(s.reason).toBe('cycles');
		expect(calibrationDue('2026-06-01', { today: '2026-12-02', cyclesUsed: 4999 }).state).toBe(
			'ok'
		);
	});

	it('shop interval and month ends', () => {
		expect(calibrationDue('2026-06-01', { months: 6, today: '2026-12-02' }).state).toBe('overdue');
		expect(addMonths('2024-02-29', 12)).toBe('2025-02-28');
		expect(addMonths('2026-01-31', 1)).toBe('2026-02-28');
		expect(() => calibrationDue('someday')).toThrow(/must be a date like/);
		expect(() => calibrationDue('2026-01-01', { months: 0 })).toThrow(/1 to 120 whole months/);
	});
});
