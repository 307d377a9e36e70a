import type { CompactPart } from '$lib/catalogue/compact-part';
import { endpoint } from '$lib/server/api';
import { requirePermission } from '$lib/server/guards';
import * as catalogue from '$lib/server/catalogue';
import { sheetFormat, sheetResponse, type Sheet } from '$lib/server/sheets';
import { KIND_LABEL, LIFECYCLE_LABEL, MATERIAL_LABEL, type Lifecycle } from '$lib/catalogue/vocabulary';
import { buildIndex, search, type Filters } from '../search';

type Row = CompactPart;

// Columns as the list shows them, numbers in SI base units (the unit row says which).
const COLUMNS: { id: string; label: string; unit: string; value: (p: Row) => string | number | null }[] = [
	{ id: 'pn', label: 'Part number', unit: '', value: (p) => p.pn },
	{ id: 'mk', label: 'Maker', unit: '', value: (p) => p.mk },
	{ id: 'kind', label: 'Kind', unit: '', value: (p) => KIND_LABEL[p.kind] },
	{ id: 'pkg', label: 'Package', unit: '', value: (p) => p.pkg || null },
	{ id: 'mat', label: 'Material', unit: '', value: (p) => MATERIAL_LABEL[p.mat] },
	{ id: 'is', label: 'IS typical', unit: 'A', value: (p) => p.is },
	{ id: 'n', label: 'N typical', unit: '1', value: (p) => p.n },
	{ id: 'rs', label: 'RS typical', unit: 'Ω', value: (p) => p.rs },
	{ id: 'rsh', label: 'RSH typical', unit: 'Ω', value: (p) => p.rsh },
	{ id: 'vr', label: 'Rated reverse voltage', unit: 'V', value: (p) => p.vr },
	{ id: 'samples', label: 'Samples measured', unit: 'count', value: (p) => (p.samples === null || p.samples < 0 ? null : p.samples) },
	{ id: 'model', label: 'Model', unit: '', value: (p) => (p.samples === null ? 'none' : p.samples < 0 ? 'given, not measured' : 'measured') },
	{ id: 'life', label: 'Lifecycle', unit: '', value: (p) => LIFECYCLE_LABEL[p.life as Lifecycle] ?? p.life },
	{ id: 'tags', label: 'Tags', unit: '', value: (p) => p.tags.join(', ') || null },
	{ id: 'id', label: 'Catalogue id', unit: '', value: (p) => p.id }
];

/** The list's sort from ?sort=id or -id: numbers ascending with blanks last, text in natural order. */
function sorted(rows: Row[], sort: string | null): Row[] {
	const col = COLUMNS.find((c) => c.id === sort?.replace(/^-/, ''));
	if (!col) return rows;
	const dir = sort!.startsWith('-') ? -1 : 1;
	return [...rows].sort((a, b) => {
		const x = col.value(a);
		const y = col.value(b);
		if (x === null || y === null) return x === y ? 0 : x === null ? 1 : -1;
		if (typeof x === 'number' && typeof y === 'number') return dir * (x - y);
		return dir * String(x).localeCompare(String(y), undefined, { numeric: true });
	});
}

/** GET /catalogue/export?format=csv|xlsx with the catalogue page's filters and sort: every matching part. */
export const GET = endpoint(async (event) => {
	requirePermission(event, 'catalogue:read');
	const format = sheetFormat(event.url);
	const sp = event.url.searchParams;
	const filters: Filters = { q: sp.get('q') ?? '', kind: sp.get('kind') ?? '', pkg: sp.get('pkg') ?? '', mat: sp.get('mat') ?? '', life: sp.get('life') ?? '' };
	const parts = await catalogue.compactList();
	const rows = sorted(search(parts, buildIndex(parts), filters), sp.get('sort'));
	const sheet: Sheet = { name: 'Catalogue', columns: COLUMNS.map((c) => ({ label: c.label, unit: c.unit })), rows: rows.map((p) => COLUMNS.map((c) => c.value(p))) };
	return sheetResponse(sheet, format, `junctionary-catalogue-${new Date().toISOString().slice(0, 10)}`);
});
