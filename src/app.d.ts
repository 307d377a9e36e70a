// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Role } from '$lib/permissions';

declare global {
	namespace App {
		interface Error {
			message: string;
			code?: string;
			issues?: { path?: string; row?: number; column?: string; message: string }[];
		}
		interface User {
			id: string;
			email: string;
			name: string;
			roles: Role[];
		}
		interface Locals {
			user: User | null;
			/** How the person was identified: browser session or API token. */
			via: 'session' | 'token' | null;
			/** Set when a load failed because PostgreSQL was unreachable (answered as 503). */
			databaseDown?: boolean;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
