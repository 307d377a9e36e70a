/** How many rows the ranking screen asks for, and how many leading candidates get curves. */
export const RANK_PAGE_ROWS = 100;
/**
 * How many of those rows are drawn until the designer asks for the rest: the top of the
 * list is what gets read, and every drawn row is redrawn on each re-ranking.
 */
export const RANK_FIRST_ROWS = 25;
/** The query parameter (`?show=all`) that draws every listed row, with or without JavaScript. */
export const SHOW_ALL_PARAM = 'show';
export const CURVE_COUNT = 5;
/** Parts compared side by side. */
export const COMPARE_MIN = 2;
export const COMPARE_MAX = 4;
