import type { ParamMatcher } from '@sveltejs/kit';

/** Row ids in URLs are positive integers. */
export const match: ParamMatcher = (param) => /^[1-9]\d{0,15}$/.test(param);
