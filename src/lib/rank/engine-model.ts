/**
 * A catalogue model (SPICE names plus the part's material) as an engine model, for
 * curves drawn in the browser with the same equations as the server.
 */
import { createModel, type JunctionMaterial, type JunctionModel } from '$lib/junction';
import type { SpiceModel } from '$lib/schemas/rank';

/** Germanium band gap 0.66 eV at 300 K (S. M. Sze, Physics of Semiconductor Devices, 3rd ed., App. G). */
const GERMANIUM_EG = 0.66;

export function engineModelOf(model: SpiceModel & { material?: string }, kind?: string): JunctionModel {
	const { material, ...params } = model;
	const mat: JunctionMaterial =
		material === 'metal-semiconductor' || kind === 'schottky' ? 'schottky' : material === 'wide-gap' ? 'wide-gap' : 'silicon';
	const input = { ...params };
	if (material === 'germanium' && input.EG === undefined) input.EG = GERMANIUM_EG;
	return createModel(input, mat);
}

/** Evenly spaced samples lo…hi, n points. */
export function linspace(lo: number, hi: number, n: number): number[] {
	if (n < 2) return [lo];
	return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
}
