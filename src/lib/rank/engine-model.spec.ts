import { describe, expect, it } from 'vitest';
import { FLAG_CODES, MATERIAL_DEFAULTS, SPICE_DEFAULTS } from '$lib/junction';
import { FLAG_WORDS, RANK_FLAGS } from '$lib/schemas/rank';
import { engineModelOf, materialOf } from './engine-model';

describe('catalogue model → engine model', () => {
	it('takes EG and XTI from the engine by material: germanium 0.67 eV / 3 (Streetman & Banerjee)', () => {
		const ge = engineModelOf({ IS: 1e-6, N: 1.05, material: 'germanium' });
		expect(ge.material).toBe('germanium');
		expect(ge.EG).toBe(0.67);
		expect(ge.EG).toBe(MATERIAL_DEFAULTS.germanium.EG);
		expect(ge.XTI).toBe(3);
	});

	it('treats a Schottky part as metal–semiconductor (0.69 eV, XTI 2, as SPICE documentation quotes), whatever its record says', () => {
		for (const m of [engineModelOf({ IS: 1e-8, N: 1.05, material: 'silicon' }, 'schottky'), engineModelOf({ IS: 1e-8, N: 1.05, material: 'schottky' })]) {
			expect(m.material).toBe('metal-semiconductor');
			expect([m.EG, m.XTI]).toEqual([0.69, 2]);
		}
	});

	it('marks a wide-gap model without EG as assumed, keeps a given EG unmarked, and falls back on silicon for an unknown name', () => {
		const assumed = engineModelOf({ IS: 1e-20, N: 2, material: 'wide-gap' }, 'led');
		expect(assumed.EG).toBe(MATERIAL_DEFAULTS['wide-gap'].EG);
		expect(assumed.egAssumed).toBe(true);
		const given = engineModelOf({ IS: 1e-20, N: 2, EG: 2.9, material: 'wide-gap' }, 'led');
		expect(given.EG).toBe(2.9);
		expect(given.egAssumed).toBeUndefined();
		expect(materialOf(undefined)).toBe('silicon');
		expect(materialOf('unobtainium', 'diode')).toBe('silicon');
		const si = engineModelOf({ IS: 1e-14, N: 1 });
		expect([si.EG, si.XTI, si.N, si.TNOM]).toEqual([1.11, 3, SPICE_DEFAULTS.N, SPICE_DEFAULTS.TNOM]);
	});
});

describe('rank flags', () => {
	it('the API lists exactly the engine flag codes, each with plain words', () => {
		expect([...RANK_FLAGS]).toEqual([...FLAG_CODES]);
		for (const f of RANK_FLAGS) {
			expect(FLAG_WORDS[f].short.length).toBeGreaterThan(3);
			expect(FLAG_WORDS[f].long.length).toBeGreaterThan(30);
		}
		expect(FLAG_WORDS['band-gap-assumed'].long).toContain(`${MATERIAL_DEFAULTS['wide-gap'].EG} eV`);
	});
});
