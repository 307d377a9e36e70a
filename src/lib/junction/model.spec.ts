import { describe, expect, it } from 'vitest';
import { canonicalMaterial, createModel, MATERIAL_DEFAULTS } from './model';
import { MATERIALS } from './names';

describe('material defaults', () => {
	it('cover exactly the catalogue materials', () => {
		expect(Object.keys(MATERIAL_DEFAULTS).sort()).toEqual([...MATERIALS].sort());
	});

	// Silicon and metal–semiconductor: SPICE documentation's customary EG/XTI (Berkeley SPICE
	// user guides, from memory). Germanium: 0.67 eV at 300 K (Streetman & Banerjee, Solid State
	// Electronic Devices, semiconductor-properties appendix; from memory), XTI 3 as for any PN
	// junction (common practice). Wide-gap: 1.9 eV, a red LED's band gap, assumed.
	it.each([
		['silicon', 1.11, 3, undefined],
		['metal-semiconductor', 0.69, 2, undefined],
		['germanium', 0.67, 3, undefined],
		['wide-gap', 1.9, 3, true]
	] as const)('%s: EG %s eV, XTI %s, assumed %s', (material, EG, XTI, assumed) => {
		const m = createModel({ IS: 1e-12 }, material);
		expect(m.material).toBe(material);
		expect(m.EG).toBe(EG);
		expect(m.XTI).toBe(XTI);
		expect(m.egAssumed).toBe(assumed);
	});

	it("reads the older name 'schottky' as metal-semiconductor", () => {
		const m = createModel({ IS: 1e-8 }, 'schottky');
		expect(m.material).toBe('metal-semiconductor');
		expect(m.EG).toBe(0.69);
		expect(m.XTI).toBe(2);
		expect(canonicalMaterial('schottky')).toBe('metal-semiconductor');
	});

	it('marks only an EG that came from the assumed default, and keeps the mark on rebuilding', () => {
		expect(createModel({ IS: 1e-15, EG: 2.7 }, 'wide-gap').egAssumed).toBeUndefined();
		const assumed = createModel({ IS: 1e-15 }, 'wide-gap');
		expect(createModel(assumed).egAssumed).toBe(true);
	});

	it('refuses an unknown material', () => {
		expect(() => createModel({ IS: 1e-14 }, 'unobtainium' as never)).toThrow(/unknown junction material 'unobtainium'/);
		expect(() => canonicalMaterial('toString' as never)).toThrow(RangeError);
	});
});

describe('a model without its saturation current is refused', () => {
	it.each([
		['IS missing', {}],
		['IS not a number', { IS: Number.NaN }],
		['IS zero', { IS: 0 }],
		['IS negative', { IS: -1e-14 }]
	])('%s', (_name, input) => {
		expect(() => createModel(input as { IS: number })).toThrow(/IS/);
	});
});
