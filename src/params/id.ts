import type { ParamMatcher } from '@sveltejs/kit';

/** A positive database id; anything else is a 404 before any load runs. */
export const match: ParamMatcher = (param) => /^[1-9]\d{0,9}$/.test(param);
