/**
 * Physical constants used by the junction engine.
 *
 * The engine never reads a global constant directly: every numeric routine
 * takes a `PhysicalConstants` object so that results can be reproduced with
 * the exact SI 2019 values (default) or with the older CODATA 2014 values that
 * ngspice 39 still compiles in (useful when comparing against a simulator).
 */

export interface PhysicalConstants {
	/** Name of the data set, for reports. */
	readonly name: string;
	/** Boltzmann constant k in J/K. */
	readonly k: number;
	/** Elementary charge q in C. */
	readonly q: number;
}

/**
 * Exact defining constants of the revised SI.
 * Source: BIPM, The International System of Units (SI Brochure), 9th ed., 2019, Table 1.
 */
export const SI_2019: PhysicalConstants = Object.freeze({
	name: 'SI 2019 (exact)',
	k: 1.380649e-23,
	q: 1.602176634e-19
});

/**
 * CODATA 2014 recommended values (Mohr, Newell, Taylor, Rev. Mod. Phys. 88, 035009, 2016).
 * ngspice's const.h uses these, so tests against ngspice can remove the constant
 * difference (about 6e-8 relative in k/q) from the comparison.
 */
export const CODATA_2014: PhysicalConstants = Object.freeze({
	name: 'CODATA 2014',
	k: 1.38064852e-23,
	q: 1.6021766208e-19
});

/** Offset between the Celsius and kelvin scales (exact by definition of the Celsius scale). */
export const ZERO_CELSIUS_K = 273.15;

/**
 * Convert a Celsius temperature to kelvin: T[K] = t[°C] + 273.15.
 * @throws RangeError when the input is not finite or below absolute zero.
 */
export function celsiusToKelvin(celsius: number): number {
	if (!Number.isFinite(celsius)) throw new RangeError(`temperature must be a finite number of °C, got ${celsius}`);
	const kelvin = celsius + ZERO_CELSIUS_K;
	if (kelvin <= 0) throw new RangeError(`temperature ${celsius} °C is at or below absolute zero`);
	return kelvin;
}

/**
 * Convert kelvin to Celsius: t[°C] = T[K] − 273.15.
 * @throws RangeError when the input is not a finite positive temperature.
 */
export function kelvinToCelsius(kelvin: number): number {
	if (!Number.isFinite(kelvin) || kelvin <= 0)
		throw new RangeError(`absolute temperature must be a finite number above 0 K, got ${kelvin}`);
	return kelvin - ZERO_CELSIUS_K;
}

/**
 * Thermal voltage Vt = k·T/q, in volts, for an absolute temperature T in kelvin.
 * Source of the constants: BIPM SI Brochure, 9th ed., 2019 (default set).
 * @throws RangeError when T is not a finite positive number or the constants are invalid.
 */
export function thermalVoltage(temperatureK: number, constants: PhysicalConstants = SI_2019): number {
	if (!Number.isFinite(temperatureK) || temperatureK <= 0)
		throw new RangeError(`absolute temperature must be a finite number above 0 K, got ${temperatureK}`);
	if (!(constants.k > 0) || !(constants.q > 0)) throw new RangeError('physical constants k and q must be positive');
	return (constants.k * temperatureK) / constants.q;
}
