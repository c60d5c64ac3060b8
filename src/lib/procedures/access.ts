// Who may read and who may change the procedure library. Pure.
import type { Role } from '$lib/auth/roles';

export const procedureReaders: readonly Role[] = [
	'owner',
	'foreman',
	'service_writer',
	'technician'
];
export const procedureEditors: readonly Role[] = ['owner', 'foreman'];
