// See https://svelte.dev/docs/kit/types#app.d.ts
import type { SignedInUser } from '$lib/server/users';

declare global {
	namespace App {
		interface Error {
			message: string;
		}
		interface Locals {
			/** The caller, read from the database on every request; null when signed out. */
			user: SignedInUser | null;
			/** The project the route belongs to, once the hooks have checked membership. */
			projectId?: number;
		}
		interface PageData {
			title?: string;
		}
	}
}

export {};
