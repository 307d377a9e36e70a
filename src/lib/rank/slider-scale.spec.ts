import { describe, expect, it } from 'vitest';
import { BIAS_SLIDER, biasToSlider, sliderToBias, stepBias, stepTemperature } from './slider-scale';

describe('bias slider scale', () => {
	it('maps zero to the middle and the ends to the stated biases', () => {
		expect(biasToSlider(0)).toBe(0);
		expect(biasToSlider(-200)).toBeCloseTo(-1, 12);
		expect(sliderToBias(-1)).toBe(-200);
		expect(sliderToBias(BIAS_SLIDER.max)).toBe(1);
		expect(biasToSlider(-1e6)).toBe(-1);
	});

	it('returns a tidy bias near the one it came from', () => {
		for (const v of [-150, -47, -5, -1.2, -0.33, -0.05, 0.2, 0.75]) {
			const back = sliderToBias(biasToSlider(v));
			expect(Math.abs(back - v) / Math.abs(v)).toBeLessThan(0.01);
			// At most three significant digits, whole millivolts: the text the field shows.
			expect(Number(back.toPrecision(3))).toBe(back);
		}
	});

	it('is logarithmic: each decade of reverse bias takes the same length', () => {
		const d1 = biasToSlider(-1) - biasToSlider(-10);
		const d2 = biasToSlider(-10) - biasToSlider(-100);
		expect(Math.abs(d1 - d2) / d1).toBeLessThan(0.01);
	});
});

describe('arrow steps', () => {
	it('step a tenth of the leading decade, away from and toward zero', () => {
		expect(stepBias(-5, -1)).toBe(-5.1);
		expect(stepBias(-5, 1)).toBe(-4.9);
		expect(stepBias(-50, -1)).toBe(-51);
		expect(stepBias(-0.5, -1)).toBe(-0.51);
		expect(stepBias(-9.9, -1)).toBe(-10);
		expect(stepBias(-10, -1)).toBe(-11);
		expect(stepBias(-1, 1)).toBe(-0.99);
		expect(stepBias(-10, 1)).toBe(-9.9);
		expect(stepBias(0, -1)).toBe(-0.001);
		expect(stepBias(0.3, 1)).toBe(0.31);
		expect(stepBias(-200, -1)).toBe(-200);
		// Off the grid: to the next multiple of the step, either way.
		expect(stepBias(-5.05, 1)).toBe(-5);
		expect(stepBias(-5.05, -1)).toBe(-5.1);
	});

	it('step temperatures by a kelvin, or ten with page keys, within the range', () => {
		expect(stepTemperature(85, 1)).toBe(86);
		expect(stepTemperature(85, -1, true)).toBe(80);
		expect(stepTemperature(85, 1, true)).toBe(90);
		expect(stepTemperature(84, 1, true)).toBe(90);
		expect(stepTemperature(80, -1, true)).toBe(70);
		expect(stepTemperature(175, 1)).toBe(175);
	});
});
