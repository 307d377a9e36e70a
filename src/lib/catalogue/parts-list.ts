// Reading a parts list (a table from a CSV or spreadsheet file) into part inputs, with every
// problem placed at its row and column. Pure: the server reads the file into a table, this
// decides what each row means; the preview screen and the import API show its answer.
import { parseQuantity, parseTemperature, type QuantityKind } from '../junction/units';
import { partInput, type PartInput } from '../schemas/catalogue';
import { JUNCTION_KINDS, KIND_LABEL, LIFECYCLES, LIFECYCLE_LABEL, MATERIALS, MATERIAL_LABEL } from './vocabulary';

/** A cell as a reader gives it: text, or a number when the spreadsheet stored one. */
export type Cell = string | number | boolean | null;
/** The sheet as read: the header row and the data rows, row numbers as the sheet shows them. */
export type Table = { header: Cell[]; rows: { row: number; cells: Cell[] }[] };
export type Problem = { row: number; column: string; message: string };

export type Field =
	| 'partNumber'
	| 'maker'
	| 'kind'
	| 'package'
	| 'material'
	| 'admitsLight'
	| 'anodePins'
	| 'cathodePins'
	| 'reverseV'
	| 'forwardA'
	| 'junctionC'
	| 'tags'
	| 'lifecycle'
	| 'notes';

type ColumnSpec = { field: Field; label: string; names: string[]; quantity?: QuantityKind | 'temperature'; unit?: string };

/** The columns a parts list may have, with the names people give them (matched without case, spaces or punctuation). */
export const PART_COLUMNS: ColumnSpec[] = [
	{ field: 'partNumber', label: 'Part number', names: ['part number', 'part no', 'part', 'pn', 'part num', 'number'] },
	{ field: 'maker', label: 'Maker', names: ['maker', 'manufacturer', 'mfr', 'make', 'vendor'] },
	{ field: 'kind', label: 'Kind', names: ['kind', 'junction kind', 'junction', 'type'] },
	{ field: 'package', label: 'Package', names: ['package', 'pkg', 'case'] },
	{ field: 'material', label: 'Material', names: ['material', 'junction material'] },
	{ field: 'admitsLight', label: 'Admits light', names: ['admits light', 'lets light in', 'light', 'transparent package'] },
	{ field: 'anodePins', label: 'Anode pins', names: ['anode pins', 'anode', 'anode pin'] },
	{ field: 'cathodePins', label: 'Cathode pins', names: ['cathode pins', 'cathode', 'cathode pin'] },
	{ field: 'reverseV', label: 'Rated reverse voltage', quantity: 'voltage', unit: 'V', names: ['rated reverse voltage', 'reverse voltage', 'reverse rating', 'vr', 'vrrm', 'vr max'] },
	{ field: 'forwardA', label: 'Rated forward current', quantity: 'current', unit: 'A', names: ['rated forward current', 'forward current', 'if', 'if max', 'ifm'] },
	{ field: 'junctionC', label: 'Rated junction temperature', quantity: 'temperature', unit: '°C', names: ['rated junction temperature', 'junction temperature', 'tj', 'tj max', 'max junction temperature'] },
	{ field: 'tags', label: 'Tags', names: ['tags', 'tag', 'keywords'] },
	{ field: 'lifecycle', label: 'Lifecycle', names: ['lifecycle', 'life cycle', 'status'] },
	{ field: 'notes', label: 'Notes', names: ['notes', 'note', 'comment', 'comments'] }
];
const REQUIRED: Field[] = ['partNumber', 'maker', 'kind'];

const squash = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');

/** A header split into its name and the unit written after it: "Reverse voltage (kV)", "VR [V]", "Tj / °C". */
export function splitHeader(text: string): { name: string; unit: string } {
	const m = /^(.*?)\s*(?:\(([^)]*)\)|\[([^\]]*)\]|\/\s*(\S+)|,\s*(\S+))\s*$/.exec(text.trim());
	if (!m) return { name: text.trim(), unit: '' };
	return { name: m[1].trim(), unit: (m[2] ?? m[3] ?? m[4] ?? m[5] ?? '').trim() };
}

/** How one column of the file is read: which field, and the factor (or temperature scale) its header's unit gives. */
type Mapped = { index: number; heading: string; spec: ColumnSpec; unit: string };

function mapHeader(header: Cell[]): { mapped: Mapped[]; problems: Problem[]; ignored: string[] } {
	const mapped: Mapped[] = [];
	const problems: Problem[] = [];
	const ignored: string[] = [];
	header.forEach((cell, index) => {
		const heading = String(cell ?? '').trim();
		if (!heading) return;
		const { name, unit } = splitHeader(heading);
		const spec = PART_COLUMNS.find((c) => c.names.some((n) => squash(n) === squash(name)) || squash(c.label) === squash(name));
		if (!spec) return void ignored.push(heading);
		if (mapped.some((m) => m.spec.field === spec.field)) {
			problems.push({ row: 1, column: heading, message: `a second ${spec.label} column; keep one` });
			return;
		}
		if (unit && spec.quantity) {
			const err = unitProblem(spec, unit);
			if (err) problems.push({ row: 1, column: heading, message: err });
		} else if (unit && !spec.quantity) problems.push({ row: 1, column: heading, message: `${spec.label} takes no unit, but the header says ${unit}` });
		mapped.push({ index, heading, spec, unit });
	});
	for (const field of REQUIRED) {
		if (!mapped.some((m) => m.spec.field === field)) {
			const spec = PART_COLUMNS.find((c) => c.field === field)!;
			problems.push({ row: 1, column: spec.label, message: `no ${spec.label} column; the header row needs one (for example "${spec.label}")` });
		}
	}
	return { mapped, problems, ignored };
}

function unitProblem(spec: ColumnSpec, unit: string): string | null {
	try {
		if (spec.quantity === 'temperature') parseTemperature(`300 ${unit}`);
		else parseQuantity(`1 ${unit}`, spec.quantity);
		return null;
	} catch {
		return `the unit ${unit} in the header is not ${spec.quantity === 'temperature' ? 'a temperature unit (°C or K)' : `a unit of ${spec.quantity} (${spec.unit} with an SI prefix)`}`;
	}
}

/** A quantity cell in SI base units (°C for temperatures); a bare number takes the header's unit. @throws Error naming what was expected. */
export function readQuantity(cell: Cell, spec: ColumnSpec, headerUnit: string): number {
	const text = typeof cell === 'number' ? String(cell) : String(cell ?? '').trim();
	const bare = /^[+\-\u2212]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?$/.test(text);
	const withUnit = bare && headerUnit ? `${text} ${headerUnit}` : text;
	if (spec.quantity === 'temperature') {
		const t = parseTemperature(withUnit);
		return t.celsius;
	}
	return parseQuantity(withUnit, spec.quantity);
}

/** Matches a word against a vocabulary's codes and screen labels, without case. */
function fromVocabulary<T extends string>(text: string, codes: readonly T[], labels: Record<T, string>): T | undefined {
	const s = squash(text);
	return codes.find((c) => squash(c) === s || squash(labels[c]) === s);
}

const YES = ['yes', 'y', 'true', '1', 'x', 'glass', 'clear'];
const NO = ['no', 'n', 'false', '0', '', 'opaque'];

/** One row's values before validation, and the problems its cells have on their own. */
function readCells(cells: Cell[], mapped: Mapped[], row: number) {
	const values: Partial<Record<Field, unknown>> = {};
	const problems: Problem[] = [];
	for (const m of mapped) {
		const raw = cells[m.index];
		const text = raw === null || raw === undefined ? '' : String(raw).trim();
		const problem = (message: string) => problems.push({ row, column: m.heading, message });
		if (text === '') continue;
		const { field } = m.spec;
		if (m.spec.quantity) {
			try {
				values[field] = readQuantity(raw, m.spec, m.unit);
			} catch (e) {
				problem((e as Error).message);
			}
		} else if (field === 'kind') {
			const kind = fromVocabulary(text, JUNCTION_KINDS, KIND_LABEL);
			if (kind) values.kind = kind;
			else problem(`expected one of ${JUNCTION_KINDS.join(', ')}, got '${text}'`);
		} else if (field === 'material') {
			const mat = fromVocabulary(text, MATERIALS, MATERIAL_LABEL);
			if (mat) values.material = mat;
			else problem(`expected one of ${MATERIALS.join(', ')}, got '${text}'`);
		} else if (field === 'lifecycle') {
			const life = fromVocabulary(text, LIFECYCLES, LIFECYCLE_LABEL);
			if (life) values.lifecycle = life;
			else problem(`expected one of ${LIFECYCLES.join(', ')}, got '${text}'`);
		} else if (field === 'admitsLight') {
			const t = text.toLowerCase();
			if (YES.includes(t)) values.admitsLight = true;
			else if (NO.includes(t)) values.admitsLight = false;
			else problem(`expected yes or no, got '${text}'`);
		} else if (field === 'tags') {
			values.tags = text
				.split(/[,;]/)
				.map((t) => t.trim())
				.filter(Boolean);
		} else values[field] = text;
	}
	return { values, problems };
}

/** The field a validation issue is about, for placing it in its column. */
function issueField(path: PropertyKey[]): Field | undefined {
	const key = String(path[0] === 'ratings' ? path[1] : path[0]);
	return PART_COLUMNS.find((c) => c.field === key)?.field;
}

export type ListRow = {
	row: number;
	/** The part as it will be stored, when the row has no problem. */
	input: PartInput | null;
	/** The fields the file gives for this row (absent columns leave an existing part's value alone). */
	given: Field[];
	problems: Problem[];
};

export type PartsList = { rows: ListRow[]; problems: Problem[]; columns: { heading: string; field: Field; label: string }[]; ignored: string[] };

/** Reads every row of a parts list; problems carry the sheet's row number and the column's heading. */
export function readPartsList(table: Table): PartsList {
	const head = mapHeader(table.header);
	const columnOf = (f: Field) => head.mapped.find((m) => m.spec.field === f)?.heading ?? PART_COLUMNS.find((c) => c.field === f)!.label;
	const seen = new Map<string, number>();
	const rows: ListRow[] = [];
	for (const { row, cells } of table.rows) {
		if (cells.every((c) => c === null || c === undefined || String(c).trim() === '')) continue;
		const { values, problems } = readCells(cells, head.mapped, row);
		// A blank cell leaves an existing part's value as it is.
		const given = head.mapped.map((m) => m.spec.field).filter((f) => values[f] !== undefined);
		const candidate = {
			partNumber: values.partNumber ?? '',
			maker: values.maker ?? '',
			kind: values.kind ?? '',
			package: values.package,
			material: values.material,
			admitsLight: values.admitsLight,
			anodePins: values.anodePins,
			cathodePins: values.cathodePins,
			ratings: { reverseV: values.reverseV, forwardA: values.forwardA, junctionC: values.junctionC },
			tags: values.tags,
			notes: values.notes,
			lifecycle: values.lifecycle
		};
		const parsed = partInput.safeParse(candidate);
		if (!parsed.success) {
			for (const issue of parsed.error.issues) {
				const field = issueField(issue.path);
				const column = field ? columnOf(field) : 'row';
				if (!problems.some((p) => p.column === column)) problems.push({ row, column, message: field === 'kind' && !values.kind ? 'give the kind of junction' : issue.message });
			}
		}
		const key = `${squash(String(values.maker ?? ''))}\u0000${String(values.partNumber ?? '').trim()}`;
		if (values.partNumber && seen.has(key)) problems.push({ row, column: columnOf('partNumber'), message: `the same part as row ${seen.get(key)}; list each part once` });
		else if (values.partNumber) seen.set(key, row);
		rows.push({ row, input: problems.length ? null : parsed.data!, given, problems });
	}
	if (!rows.length && !head.problems.length) head.problems.push({ row: 2, column: 'row', message: 'the list has a header row but no parts' });
	return {
		rows,
		problems: [...head.problems, ...rows.flatMap((r) => r.problems)],
		columns: head.mapped.map((m) => ({ heading: m.heading, field: m.spec.field, label: m.spec.label })),
		ignored: head.ignored
	};
}
