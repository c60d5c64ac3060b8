// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Session } from 'lucia';
import type { SessionUser } from '$lib/server/auth';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
			session: Session | null;
		}
		interface Error {
			message: string;
			/** Shown on the error page so a report can be matched to the server log. */
			reference?: string;
		}
	}
}

export {};
