import type { ParamMatcher } from '@sveltejs/kit';

/** Largest value of a PostgreSQL integer column: larger ids cannot exist. */
export const MAX_ID = 2_147_483_647;

export const match: ParamMatcher = (p) => /^[1-9]\d{0,9}$/.test(p) && Number(p) <= MAX_ID;
