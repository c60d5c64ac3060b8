import { describe, expect, it } from 'vitest';
import { checkTransition, needsReason, nextStates } from './machine';
import { jobStates } from './states';

describe('job state machine', () => {
	it('walks the forward path when the guards are met', () => {
		expect(checkTransition('open', 'in_work')).toEqual({ ok: true });
		expect(checkTransition('in_work', 'final_inspection', { stepsTotal: 3, stepsDone: 3 })).toEqual(
			{ ok: true }
		);
		expect(
			checkTransition('final_inspection', 'ready_to_invoice', { signedOff: true, openOutOfSpec: 0 })
		).toEqual({ ok: true });
		expect(checkTransition('ready_to_invoice', 'invoiced')).toEqual({ ok: true });
		expect(checkTransition('invoiced', 'paid')).toEqual({ ok: true });
	});

	it('refuses skipping ahead with a message naming both states', () => {
		const r = checkTransition('open', 'invoiced');
		expect(r).toEqual({ ok: false, message: 'A job cannot go from open to invoiced.' });
		expect(checkTransition('in_work', 'paid').ok).toBe(false);
		expect(checkTransition('open', 'final_inspection').ok).toBe(false);
	});

	it('closes paid and cancelled jobs', () => {
		for (const to of jobStates) {
			expect(checkTransition('paid', to, {}, 'x').ok).toBe(false);
			expect(checkTransition('cancelled', to, {}, 'x').ok).toBe(false);
		}
		expect(checkTransition('paid', 'in_work', {}, 'x')).toMatchObject({
			message: 'The job is paid: its record is closed.'
		});
	});

	it('needs a reason for hold and cancel', () => {
		expect(checkTransition('in_work', 'on_hold')).toEqual({
			ok: false,
			message: 'Say why the job is on hold.'
		});
		expect(checkTransition('in_work', 'on_hold', {}, '   ').ok).toBe(false);
		expect(checkTransition('in_work', 'on_hold', {}, 'Waiting for a part').ok).toBe(true);
		expect(checkTransition('open', 'cancelled').ok).toBe(false);
		expect(checkTransition('open', 'cancelled', {}, 'Customer withdrew').ok).toBe(true);
		expect(checkTransition('invoiced', 'cancelled', {}, 'x').ok).toBe(false);
	});

	it('resumes a held job only to the state it left', () => {
		expect(checkTransition('on_hold', 'in_work', { heldFrom: 'in_work' })).toEqual({ ok: true });
		const r = checkTransition('on_hold', 'open', { heldFrom: 'in_work' });
		expect(r.ok).toBe(false);
		expect(r.ok ? '' : r.message).toContain('resumes where it left off (in work)');
		expect(checkTransition('on_hold', 'in_work').ok).toBe(false);
		expect(checkTransition('on_hold', 'cancelled', { heldFrom: 'open' }, 'gone').ok).toBe(true);
		expect(checkTransition('on_hold', 'on_hold', {}, 'x').ok).toBe(false);
	});

	it('sends to final inspection with steps open only with a reason', () => {
		const facts = { stepsTotal: 5, stepsDone: 3 };
		expect(checkTransition('in_work', 'final_inspection', facts)).toEqual({
			ok: false,
			message:
				'2 steps are not done: finish them or say why the job goes to final inspection anyway.'
		});
		expect(checkTransition('in_work', 'final_inspection', facts, 'Chain on order').ok).toBe(true);
	});

	it('makes ready to invoice wait for sign-off and answered out-of-spec entries', () => {
		expect(checkTransition('final_inspection', 'ready_to_invoice', { signedOff: false })).toEqual({
			ok: false,
			message: 'The job needs the foreman’s sign-off first.'
		});
		expect(
			checkTransition('final_inspection', 'ready_to_invoice', { signedOff: true, openOutOfSpec: 1 })
		).toEqual({
			ok: false,
			message: '1 out-of-spec entry is not answered: accept with a reason or redo first.'
		});
	});

	it('needs a reason to go back', () => {
		expect(checkTransition('final_inspection', 'in_work').ok).toBe(false);
		expect(checkTransition('final_inspection', 'in_work', {}, 'Redo rear axle').ok).toBe(true);
		expect(checkTransition('invoiced', 'ready_to_invoice', {}, 'Credit note').ok).toBe(true);
		expect(needsReason('final_inspection', 'in_work')).toBe(true);
		expect(needsReason('open', 'in_work')).toBe(false);
	});

	it('lists the reachable states', () => {
		expect(nextStates('open')).toEqual(['in_work', 'on_hold', 'cancelled']);
		expect(nextStates('on_hold', { heldFrom: 'final_inspection' })).toEqual([
			'final_inspection',
			'cancelled'
		]);
		expect(nextStates('paid')).toEqual([]);
	});
});
