/** A JointError as an API answer; anything else is a server fault and is thrown on. */
import { JointError } from './joints';
import { apiError } from './api';

export function jointErrorResponse(error: unknown): Response {
	if (error instanceof JointError) return apiError(error.status, error.message, error.field);
	throw error;
}
