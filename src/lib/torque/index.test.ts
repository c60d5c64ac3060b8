import { describe, expect, it } from 'vitest';
import {
	addMonths,
	calibrationDue,
	checkClickWrench,
	extensionSetting,
	iso6789TypeIIClassA
} from './index';

describe('extensionSetting: published worked examples (TRADE.md §5)', () => {
	it('US Army TM 1-1500-204-23-9: 300 in·lb, L 10, E 4 → 214', () => {
		expect(extensionSetting(300, 10, 4)).toBeCloseTo(214.2857, 4);
	});

	it('US Navy aviation training manual: 100 in·lb, L 12, E 6 → 66.7', () => {
		expect(extensionSetting(100, 12, 6)).toBeCloseTo(66.7, 1);
	});

	it('Piper PA-28-161 maintenance manual §2-90: 30 ft·lb, L 1 ft, E 0.25 ft → 24', () => {
		expect(extensionSetting(30, 1, 0.25)).toBe(24);
	});

	it('Robinson R66 maintenance manual ch. 20: 135 in·lb, L 10, E 1.5 → 117.39 / 158.82', () => {
		expect(extensionSetting(135, 10, 1.5)).toBeCloseTo(117.39, 2);
		expect(extensionSetting(135, 10, 1.5, { shortens: true })).toBeCloseTo(158.82, 2);
	});

	it('no extension, no change; bad input, a clear error', () => {
		expect(extensionSetting(80, 0.4, 0)).toBe(80);
		expect(() => extensionSetting(80, 0, 0.1)).toThrow(/wrench length must be a number above zero/);
		expect(() => extensionSetting(80, 0.4, -1)).toThrow(/extension length must be zero or more/);
		expect(() => extensionSetting(80, 0.4, 0.5, { shortens: true })).toThrow(
			/must be shorter than the wrench/
		);
		expect(() => extensionSetting(Number.NaN, 0.4, 0.1)).toThrow(/target torque/);
	});
});

describe('ISO 6789 Type II class A', () => {
	it('±4 % above 10 N·m, ±6 % at or below', () => {
		// ISO 6789-1:2017 Type II class A as summarised by a tool maker (TRADE.md §5 [SRC])
		expect(iso6789TypeIIClassA(50)).toEqual({ pct: 4, min: 48, max: 52 });
		expect(iso6789TypeIIClassA(10).pct).toBe(6);
		expect(iso6789TypeIIClassA(10.5).pct).toBe(4);
		expect(iso6789TypeIIClassA(5).min).toBeCloseTo(4.7, 12);
	});

	it('judges the 10 N·m threshold in N·m whatever the reading unit', () => {
		// 90 lbf·in = 10.16863 N·m (NIST SP 811 App. B.8) → above 10 N·m → ±4 %
		expect(iso6789TypeIIClassA(90, '[lbf_av].[in_i]').pct).toBe(4);
		// 85 lbf·in = 9.6037 N·m → ±6 %
		expect(iso6789TypeIIClassA(85, '[lbf_av].[in_i]').pct).toBe(6);
	});

	it('checks a calibration reading against the band, inclusive', () => {
		expect(checkClickWrench(50, 52).ok).toBe(true);
		expect(checkClickWrench(50, 52.1).ok).toBe(false);
		expect(checkClickWrench(50, 48).ok).toBe(true);
		expect(checkClickWrench(50, 51).deviationPct).toBeCloseTo(2, 12);
		expect(() => checkClickWrench(50, -1)).toThrow(/measured torque/);
	});
});

describe('calibration due', () => {
	it('12 months by default (tool-maker guidance, TRADE.md §5)', () => {
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
		// 12 months or 5 000 cycles (tool-maker guidance, TRADE.md §5 [SRC])
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
