import { describe, expect, it } from 'vitest';
import { actionAnswer } from './form';

describe('actionAnswer', () => {
	const failed = {
		action: 'step',
		stepId: 's2',
		errors: { nominal: 'A number, please.' },
		values: { nominal: 'twelve' }
	};

	it('gives the errors and values to the form that sent them', () => {
		expect(actionAnswer(failed, 'step', { stepId: 's2' })).toEqual({
			errors: { nominal: 'A number, please.' },
			values: { nominal: 'twelve' }
		});
		expect(actionAnswer(failed, 'step')).toEqual({
			errors: failed.errors,
			values: failed.values
		});
	});

	it('gives every other form nothing', () => {
		const none = { errors: {}, values: {} };
		expect(actionAnswer(failed, 'step', { stepId: 's1' })).toEqual(none);
		expect(actionAnswer(failed, 'create')).toEqual(none);
		expect(actionAnswer(null, 'step')).toEqual(none);
		expect(actionAnswer({ action: 'step' }, 'step')).toEqual(none);
	});
});
