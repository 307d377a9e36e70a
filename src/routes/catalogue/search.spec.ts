import { describe, expect, it } from 'vitest';
import type { CompactPart } from '$lib/catalogue/compact-part';
import { JUNCTION_KINDS } from '$lib/junction/names';
import { mulberry32 } from '$lib/random';
import { buildIndex, MAX_CANDIDATES, search, type Filters } from './search';

let nextId = 1;
function part(pn: string, o: Partial<CompactPart> = {}): CompactPart {
	return {
		id: nextId++,
		pn,
		mk: 'Tallowmere Devices',
		kind: 'diode',
		pkg: 'SOT-23',
		mat: 'silicon',
		life: 'in-use',
		tags: [],
		is: 1e-14,
		n: 1.5,
		rs: 2,
		rsh: null,
		samples: 3,
		vr: 30,
		updated: 0,
		...o
	};
}

// A small invented catalogue.
const PARTS: CompactPart[] = [
	part('LX-1004', { tags: ['guard'] }),
	part('HRB-D20P', { mk: 'Harrowgate Semi', tags: ['picoamp', 'low-leakage', 'guard'] }),
	part('HRB-D20', { mk: 'Harrowgate Semi', kind: 'schottky', mat: 'metal-semiconductor', pkg: 'SOD-323' }),
	part('QM-220', { mk: 'Quillmark Semi', kind: 'led', mat: 'wide-gap', life: 'retired', tags: ['indicator'] }),
	part('QM-2201A', { mk: 'Quillmark Semi', kind: 'bjt-be', tags: ['matched pair'] }),
	part('OV-9911', { mk: 'Ostler & Vane', kind: 'jfet-gate', pkg: 'TO-92', tags: ['electrometer'] }),
	part('TD-0417GL', { mk: 'Brightwater Test Fab', pkg: 'DO-35 glass', life: 'not-for-new' })
];
const INDEX = buildIndex(PARTS);
const q = (text: string, f: Partial<Filters> = {}) => search(PARTS, INDEX, { q: text, kind: '', pkg: '', mat: '', life: '', ...f }).map((p) => p.pn);

describe('catalogue search', () => {
	it('finds a part by a misspelt number', () => {
		expect(q('HBR-D20')).toContain('HRB-D20P');
		expect(q('hrb d2op').slice(0, 2)).toContain('HRB-D20P');
		expect(q('TD-0147GL')[0]).toBe('TD-0417GL');
	});

	it('puts exact part-number hits first, then prefixes, then fuzzy ones', () => {
		expect(q('HRB-D20')[0]).toBe('HRB-D20');
		expect(q('hrb-d20').slice(0, 2)).toEqual(['HRB-D20', 'HRB-D20P']);
		expect(q('qm220').slice(0, 2)).toEqual(['QM-220', 'QM-2201A']);
		// Anywhere in the number ranks after the start of a number.
		expect(q('220')).toEqual(expect.arrayContaining(['QM-220', 'QM-2201A']));
	});

	it('applies the filters, with and without a query', () => {
		expect(q('', { kind: 'schottky' })).toEqual(['HRB-D20']);
		expect(q('hrb-d20', { pkg: 'SOT-23' })).toEqual(['HRB-D20P']);
		expect(q('qm', { life: 'retired' })).toEqual(['QM-220']);
		expect(q('', { mat: 'wide-gap' })).toEqual(['QM-220']);
		expect(q('quillmark', { kind: 'diode' })).toEqual([]);
	});

	it('returns the whole catalogue, in its own order, for an empty query', () => {
		expect(q('')).toEqual(PARTS.map((p) => p.pn));
		expect(q('   ')).toEqual(PARTS.map((p) => p.pn));
	});

	it('matches one- and two-character queries literally only', () => {
		// Numbers starting with the query first, then containing it; makers, tags and kinds by word start.
		expect(q('qm').slice(0, 2).sort()).toEqual(['QM-220', 'QM-2201A']);
		expect(q('o')).toEqual(['OV-9911']); // its number and its maker's first word; "Tallowmere" does not count
		expect(q('ma')).toEqual(['QM-2201A']); // "matched pair"
		expect(q('zz')).toEqual([]);
		// No typo tolerance this short: "hb" is not "hr".
		expect(q('hb')).toEqual([]);
	});

	it('finds parts by maker, tag and kind, also misspelt', () => {
		expect(q('quillmark').sort()).toEqual(['QM-220', 'QM-2201A']);
		expect(q('quilmark').sort()).toEqual(['QM-220', 'QM-2201A']);
		expect(q('electrometer')).toEqual(['OV-9911']);
		expect(q('elektrometer')).toEqual(['OV-9911']);
		expect(q('low leakage')).toContain('HRB-D20P');
		expect(q('matched')).toEqual(['QM-2201A']);
		expect(q('schottky')).toEqual(['HRB-D20']);
		expect(q('Schottky diode')).toEqual(['HRB-D20']);
	});
});

describe('catalogue search at scale', () => {
	// 10k invented parts, with the demo's part hidden among them.
	const r = mulberry32(5);
	const many = Array.from({ length: 10_000 }, (_, i) =>
		part(`${['LX', 'QM', 'HRB', 'OV', 'TD'][i % 5]}-${String(Math.floor(r() * 99999)).padStart(5, '0')}${['', 'A', 'GL', 'LL'][i % 4]}`, {
			kind: JUNCTION_KINDS[i % JUNCTION_KINDS.length],
			tags: i % 3 ? ['low leakage'] : ['clamp']
		})
	);
	many.splice(4321, 0, part('HRB-D20P', { mk: 'Harrowgate Semi' }));
	const index = buildIndex(many);
	const find = (text: string) => search(many, index, { q: text, kind: '', pkg: '', mat: '', life: '' });

	it('still finds a misspelt number among thousands', () => {
		expect(find('HBR-D20')[0].pn).toBe('HRB-D20P');
		// Two slips in eight characters: as near, to Fuse, as a few numeric neighbours.
		expect(find('HRB-D02P').slice(0, 5).map((p) => p.pn)).toContain('HRB-D20P');
	});

	it('finds every part of a tag, not just a first batch', () => {
		expect(find('clamp').length).toBe(many.filter((p) => p.tags.includes('clamp')).length);
		expect(find('clamp').length).toBeGreaterThan(MAX_CANDIDATES);
	});

	it('finds a typed part number exactly, whatever the punctuation', () => {
		const target = many[777];
		expect(find(target.pn)[0].pn).toBe(target.pn);
		expect(find(target.pn.replace('-', ' ').toLowerCase())[0].pn).toBe(target.pn);
	});
});
