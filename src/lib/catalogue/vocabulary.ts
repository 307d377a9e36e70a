// The catalogue's words, importable by browser code; the Drizzle schema takes its column
// types from here. Kinds and materials are the engine's lists (one vocabulary for engine,
// API and screens).
import { JUNCTION_KINDS, MATERIALS, type JunctionKind, type Material } from '../junction/names';

export { JUNCTION_KINDS, MATERIALS };
export type { JunctionKind, Material };
export const LIFECYCLES = ['in-use', 'not-for-new', 'retired'] as const;
export type Lifecycle = (typeof LIFECYCLES)[number];

export const KIND_LABEL: Record<JunctionKind, string> = {
	diode: 'PN diode',
	schottky: 'Schottky diode',
	'bjt-be': 'BJT base–emitter',
	'bjt-diode': 'Diode-connected BJT',
	'jfet-gate': 'JFET gate junction',
	led: 'LED'
};
/** A kind as people read it; a code the list does not know is shown as it is. */
export function kindLabel(kind: string): string {
	return KIND_LABEL[kind as JunctionKind] ?? kind;
}
export const LIFECYCLE_LABEL: Record<Lifecycle, string> = {
	'in-use': 'In use',
	'not-for-new': 'Not for new designs',
	retired: 'Retired'
};
export const MATERIAL_LABEL: Record<Material, string> = {
	silicon: 'Silicon PN',
	'metal-semiconductor': 'Metal–semiconductor',
	germanium: 'Germanium',
	'wide-gap': 'Wide band-gap'
};
/** The material a kind usually has, used when a part is created without one. */
export const DEFAULT_MATERIAL: Record<JunctionKind, Material> = {
	diode: 'silicon',
	schottky: 'metal-semiconductor',
	'bjt-be': 'silicon',
	'bjt-diode': 'silicon',
	'jfet-gate': 'silicon',
	led: 'wide-gap'
};
