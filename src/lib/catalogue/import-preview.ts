// The shape of a parts-list preview, shared by the import screen and the import API.
import type { Field, Problem } from './parts-list';
import type { JunctionKind, Lifecycle, Material } from './vocabulary';

/** A part's importable fields as stored (SI units, °C). */
export type PartValues = {
	partNumber: string;
	maker: string;
	kind: JunctionKind;
	package: string;
	material: Material;
	admitsLight: boolean;
	anodePins: string;
	cathodePins: string;
	reverseV: number | null;
	forwardA: number | null;
	junctionC: number | null;
	tags: string[];
	lifecycle: Lifecycle;
	notes: string;
};

export type FieldChange = { field: Field; label: string; from: unknown; to: unknown };

export type ImportRow = {
	/** The row number as the sheet shows it (the header is row 1). */
	row: number;
	action: 'create' | 'update' | 'unchanged' | 'invalid';
	/** The existing part an update or unchanged row matches. */
	id: number | null;
	values: PartValues | null;
	changes: FieldChange[];
	problems: Problem[];
};

export type ImportPreview = {
	counts: { rows: number; create: number; update: number; unchanged: number; invalid: number };
	columns: { heading: string; field: Field; label: string }[];
	ignored: string[];
	problems: Problem[];
	rows: ImportRow[];
	/** Identifies this exact plan: a confirm carrying another fingerprint is refused. */
	fingerprint: string;
};
