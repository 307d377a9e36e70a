import { describe, expect, it } from 'vitest';
import { CODATA_2014, SI_2019, celsiusToKelvin, kelvinToCelsius, thermalVoltage } from './constants';
import { expectRelClose } from './test-helpers';

describe('constants', () => {
	it('uses the exact SI 2019 values', () => {
		// BIPM SI Brochure, 9th ed., 2019, Table 1 (defining constants).
		expect(SI_2019.k).toBe(1.380649e-23);
		expect(SI_2019.q).toBe(1.602176634e-19);
		// CODATA 2014 (Mohr et al., Rev. Mod. Phys. 88, 035009, 2016).
		expect(CODATA_2014.k).toBe(1.38064852e-23);
		expect(CODATA_2014.q).toBe(1.6021766208e-19);
	});

	it('gives Vt(300 K) = 25.852 mV', () => {
		// k·300/q with the exact SI constants = 25.8520 mV (BIPM SI Brochure, 9th ed., 2019).
		expect(thermalVoltage(300) * 1e3).toBeCloseTo(25.852, 3);
		// k/q itself: 8.617333262e-5 V/K (CODATA 2018 lists k in eV/K as 8.617333262e-5, exact).
		expectRelClose(thermalVoltage(1), 8.617333262e-5, 1e-10);
	});

	it('is proportional to T and differs between constant sets by ~6e-8', () => {
		expectRelClose(thermalVoltage(600), 2 * thermalVoltage(300), 1e-15);
		const d = thermalVoltage(300, CODATA_2014) / thermalVoltage(300) - 1;
		expect(Math.abs(d)).toBeGreaterThan(1e-8);
		expect(Math.abs(d)).toBeLessThan(1e-6);
	});

	it.each([0, -1, NaN, Infinity])('rejects T = %s K', (t) => {
		expect(() => thermalVoltage(t)).toThrow(RangeError);
	});

	it('converts Celsius and kelvin (0 °C = 273.15 K by definition)', () => {
		expect(celsiusToKelvin(0)).toBe(273.15);
		expect(kelvinToCelsius(celsiusToKelvin(85))).toBeCloseTo(85, 12);
		expect(() => celsiusToKelvin(-300)).toThrow(RangeError);
	});
});
