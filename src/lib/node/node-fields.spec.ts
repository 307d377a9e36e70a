import { describe, expect, it } from 'vitest';
import { NODE_PRESETS, NODE_PRESET_KEYS } from '$lib/junction';
import { emptyNodeFields, fieldOfIssue, fieldsFromQuery, parseNodeFields, presetFields, queryFromFields } from './node-fields';

describe('node fields', () => {
	for (const key of NODE_PRESET_KEYS)
		it(`reads the preset “${NODE_PRESETS[key].name}” back through the URL unchanged`, () => {
			const f = presetFields(key);
			const again = fieldsFromQuery(new URLSearchParams(queryFromFields(f)));
			expect(again).toEqual(f);
			const { node, errors } = parseNodeFields(again);
			expect(errors).toEqual({});
			const p = NODE_PRESETS[key];
			expect(node!.rails).toEqual(p.rails);
			expect(node!.signalRangeV).toEqual(p.signalRangeV);
			expect(node!.temperatureRangeC).toEqual(p.temperatureRangeC);
			expect(node!.faultCurrentA).toBeCloseTo(p.faultCurrentA!, 15);
			expect(node!.guard?.offsetV).toBe(p.guardOffsetV);
			expect(node!.junctions).toEqual(p.junctions.map((j, i) => ({ ...j, label: `D${i + 1}`, candidate: true })));
		});

	it('keeps the ranking basis and order in the URL, leaving the defaults out, and ignores unknown ones', () => {
		const f = { ...presetFields('rail-pair'), basis: 'worst' as const, by: 'noise' as const };
		const q = queryFromFields(f);
		expect(new URLSearchParams(q).get('basis')).toBe('worst');
		expect(new URLSearchParams(q).get('by')).toBe('noise');
		expect(fieldsFromQuery(new URLSearchParams(q))).toEqual(f);
		expect(parseNodeFields(f).node!.basis).toBe('worst');
		const plain = queryFromFields(presetFields('rail-pair'));
		expect(plain).not.toMatch(/basis=|by=/);
		const odd = fieldsFromQuery(new URLSearchParams(`${plain}&basis=median&by=price`));
		expect([odd.basis, odd.by]).toEqual(['bound', 'net']);
		expect(parseNodeFields(odd).node!.basis).toBeUndefined();
	});

	it('reads what a designer types: SI prefixes, units, a noise density and a named part', () => {
		const f = { ...presetFields('rail-pair'), maxNet: '10p', maxNoise: '5 fA/√Hz', allowedError: '2 mV', tLo: '', tHi: '85 °C' };
		f.positions[1].part = 'QX-101';
		const { node } = parseNodeFields(f);
		expect(node).toMatchObject({ maxNetCurrentA: 1e-11, allowedErrorV: 0.002, temperatureC: 85 });
		expect(node!.maxNoiseA_rtHz).toBeCloseTo(5e-15, 28);
		expect(node!.junctions[1]).toEqual({ anode: 'VNEG', cathode: 'node', label: 'D2', partNumber: 'QX-101' });
	});

	it('names the field of every problem', () => {
		const f = { ...emptyNodeFields(), rails: [{ name: 'VPOS', volts: 'five' }, { name: 'VPOS', volts: '1' }], sigLo: '2', sigHi: '-2', tHi: '', fault: '0', allowedError: '1m' };
		const { node, errors } = parseNodeFields(f);
		expect(node).toBeUndefined();
		expect(Object.keys(errors).sort()).toEqual(['allowedError', 'fault', 'positions', 'rails.0.volts', 'rails.1.name', 'sigHi', 'tHi'].sort());
		expect(errors['rails.0.volts']).toMatch(/Expected a voltage/);
	});

	it('finds the field an API issue belongs to', () => {
		const f = presetFields('rail-pair');
		expect(fieldOfIssue('junctions.1.cathode', f)).toBe('positions.1.cathode');
		expect(fieldOfIssue('junctions.0', f)).toBe('positions.0');
		expect(fieldOfIssue('junctions.0.id', f)).toBe('positions.0.part');
		expect(fieldOfIssue('junctions', f)).toBe('positions');
		expect(fieldOfIssue('rails.VNEG', f)).toBe('rails.1.name');
		expect(fieldOfIssue('allowedErrorV', f)).toBe('allowedError');
		expect(fieldOfIssue('weird', f)).toBe('form');
	});
});

describe('row edits', () => {
	it('adds and drops rails and junctions, and ignores anything else', async () => {
		const { applyEdit } = await import('./node-fields');
		const f = presetFields('rail-pair');
		expect(applyEdit(f, 'add-rail').rails).toHaveLength(3);
		expect(applyEdit(f, 'add-junction').positions[2]).toEqual({ anode: 'node', cathode: 'VPOS', part: '', label: 'D3' });
		expect(applyEdit(f, 'drop-rail-0').rails.map((r) => r.name)).toEqual(['VNEG']);
		expect(applyEdit(f, 'drop-junction-1').positions).toHaveLength(1);
		expect(applyEdit(f, 'drop-everything')).toEqual(f);
		expect(f.rails).toHaveLength(2);
	});
});

describe('a saved node on the screen', () => {
	it('shows a saved node as fields that read back to the same node', async () => {
		const { fieldsFromNode } = await import('./node-fields');
		const saved = {
			rails: { VPOS: 15, VNEG: -15 },
			guard: { offsetV: 2.5e-3 },
			signalRangeV: [-10, 10] as [number, number],
			temperatureRangeC: [-40, 85] as [number, number],
			sourceResistanceOhm: 1e10,
			faultCurrentA: -0.005,
			maxNoiseA_rtHz: 3e-15,
			junctions: [
				{ anode: 'node', cathode: 'VPOS', candidate: true, label: 'up' },
				{ anode: 'guard', cathode: 'node', id: 7 }
			]
		};
		const f = fieldsFromNode(saved, (id) => `PART-${id}`);
		expect(f.positions[1].part).toBe('PART-7');
		const { node, errors } = parseNodeFields(f);
		expect(errors).toEqual({});
		expect(node).toMatchObject({ rails: saved.rails, signalRangeV: saved.signalRangeV, temperatureRangeC: saved.temperatureRangeC, faultCurrentA: -0.005, sourceResistanceOhm: 1e10 });
		expect(node!.guard!.offsetV).toBeCloseTo(2.5e-3, 15);
		expect(node!.maxNoiseA_rtHz).toBeCloseTo(3e-15, 28);
		expect(node!.junctions).toEqual([
			{ anode: 'node', cathode: 'VPOS', label: 'up', candidate: true },
			{ anode: 'guard', cathode: 'node', partNumber: 'PART-7' }
		]);
	});
});
