/**
 * A catalogue model (SPICE names plus the part's material) as an engine model, for
 * curves drawn in the browser with the same equations as the server. Material defaults
 * (EG, XTI) are the engine's MATERIAL_DEFAULTS, the one place they live.
 */
import { createModel, MATERIALS, type JunctionModel, type Material } from '$lib/junction';
import type { SpiceModel } from '$lib/schemas/rank';

/**
 * The catalogue's material for a stored material name and kind: a Schottky part is a
 * metal–semiconductor junction whatever its record says; an unknown or missing name is silicon.
 */
export function materialOf(material: string | undefined, kind?: string): Material {
	// 'schottky' is also the engine's earlier material name for the same junction.
	if (kind === 'schottky' || material === 'schottky') return 'metal-semiconductor';
	return (MATERIALS as readonly string[]).includes(material ?? '') ? (material as Material) : 'silicon';
}

/** The engine model of a catalogue model; parameters not given take the engine's defaults for its material. */
export function engineModelOf(model: SpiceModel & { material?: string }, kind?: string): JunctionModel {
	const { material, ...params } = model;
	return createModel(params, materialOf(material, kind));
}

/** Evenly spaced samples lo…hi, n points. */
export function linspace(lo: number, hi: number, n: number): number[] {
	if (n < 2) return [lo];
	return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
}
