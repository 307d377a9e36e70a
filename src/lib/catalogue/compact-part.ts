import type { JunctionKind, Material } from './vocabulary';

/** One catalogue row as the search page needs it: short keys, typical figures only. */
export type CompactPart = {
	id: number;
	pn: string;
	mk: string;
	kind: JunctionKind;
	pkg: string;
	mat: Material;
	life: string;
	tags: string[];
	/** Typical IS [A], N, RS [Ω], RSH [Ω] or null. */
	is: number | null;
	n: number | null;
	rs: number | null;
	rsh: number | null;
	/** Samples measured; −1 when the model is given, not measured; null without a model. */
	samples: number | null;
	vr: number | null;
	updated: number;
};
