import { describe, expect, it } from 'vitest';
import { chartRows, chartSummary } from './chart-summary';

const fmt = (v: number) => v.toPrecision(3);
const series = [
	{ label: 'U1', points: [{ x: 0.3, y: 1e-9 }, { x: 0.7, y: 1e-3 }] },
	{ label: 'U2', points: [{ x: 0.4, y: 2e-9 }] },
	{ label: 'empty', points: [] }
];

describe('chart summary', () => {
	it('names the x span over every series and each drawn series with its y span', () => {
		expect(chartSummary(series, { label: 'bias', format: fmt }, { label: '|I|', format: fmt })).toBe(
			'2 series over bias from 0.300 to 0.700. U1: 2 points, |I| from 1.00e-9 to 0.00100. U2: 1 point, |I| from 2.00e-9 to 2.00e-9.'
		);
	});
	it('names at most the given number of series and points to the table for the rest', () => {
		const text = chartSummary(series, { label: 'bias', format: fmt }, { label: '|I|', format: fmt }, 1);
		expect(text).toContain('U1:');
		expect(text).not.toContain('U2:');
		expect(text).toMatch(/And 1 more, in the table\.$/);
	});
	it('says so when there is nothing to draw', () => {
		expect(chartSummary([], { label: 'x', format: fmt }, { label: 'y', format: fmt })).toBe('The chart has nothing to draw.');
	});
	it('gives one row per point, in series order', () => {
		expect(chartRows(series, fmt, fmt)).toEqual([
			{ series: 'U1', x: '0.300', y: '1.00e-9' },
			{ series: 'U1', x: '0.700', y: '0.00100' },
			{ series: 'U2', x: '0.400', y: '2.00e-9' }
		]);
	});
});
