/** How many rows the ranking screen lists, and how many leading candidates get curves. */
export const RANK_PAGE_ROWS = 100;
export const CURVE_COUNT = 5;
/** Parts compared side by side. */
export const COMPARE_MIN = 2;
export const COMPARE_MAX = 4;
