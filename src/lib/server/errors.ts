/**
 * The one expected failure of a server verb: an HTTP status, a message a person can act on,
 * the field it concerns, and anything else the answer carries (such as the id of the export
 * that is already running). Anything that is not a DomainError is a server fault and is
 * thrown on, so it reaches the error page or the log instead of being dressed as a refusal.
 *
 * An API route answers it with `apiFailure`, a form action with `formFailure`; nothing else
 * tests for it.
 */
import { fail, json, type ActionFailure } from '@sveltejs/kit';
import { message, setError, type SuperValidated } from 'sveltekit-superforms';
import type { Refusal } from '$lib/domain';

export type DomainStatus = 400 | 403 | 404 | 409 | 410 | 413 | 415 | 422;

/** What a refusal may carry beside its message. */
export interface DomainExtra {
	/** The export a refused export request collides with, answered as `id`. */
	exportId?: number;
}

export class DomainError extends Error {
	readonly exportId?: number;

	constructor(
		message: string,
		readonly status: DomainStatus,
		readonly field?: string,
		extra: DomainExtra = {}
	) {
		super(message);
		this.name = 'DomainError';
		this.exportId = extra.exportId;
	}
}

/** A pure rule's refusal (src/lib/domain.ts) thrown as the domain error the routes answer. */
export function refuse(refusal: Refusal | null): void {
	if (refusal) throw new DomainError(refusal.message, refusal.status, refusal.field);
}

/** A DomainError as a JSON answer `{ error, field?, id? }`; anything else is thrown on. */
export function apiFailure(error: unknown): Response {
	if (!(error instanceof DomainError)) throw error;
	return json(
		{
			error: error.message,
			...(error.field ? { field: error.field } : {}),
			...(error.exportId !== undefined ? { id: error.exportId } : {})
		},
		{ status: error.status }
	);
}

/** What a plain form action answers on a refusal: its message, the field, and the caller's extras. */
export interface FormRefusal {
	error: true;
	message: string;
	field?: string;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- any superform, whatever its data and message types
type AnyForm = SuperValidated<Record<string, any>, any, any>;

/**
 * A DomainError as a form action's failure. With a superform, the message lands on the field
 * it names when the form has one, else as the form's message; without one, as
 * `fail(status, { error: true, message, field, …extra })`. Anything else is thrown on.
 */
export function formFailure<Form extends AnyForm>(
	error: unknown,
	form: Form
): { form: Form } | ActionFailure<{ form: Form }>;
export function formFailure<Extra extends Record<string, unknown> = Record<never, never>>(
	error: unknown,
	form?: undefined,
	extra?: Extra
): ActionFailure<FormRefusal & Extra>;
export function formFailure(
	error: unknown,
	form?: AnyForm,
	extra: Record<string, unknown> = {}
): unknown {
	if (!(error instanceof DomainError)) throw error;
	const status = error.status;
	if (form) {
		if (error.field && error.field in form.data) {
			return setError(form, error.field as '', error.message, { status });
		}
		return message(form, error.message, { status });
	}
	return fail(status, {
		...extra,
		error: true as const,
		message: error.message,
		...(error.field ? { field: error.field } : {})
	});
}
