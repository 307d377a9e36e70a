import { describe, expect, test } from 'vitest';
import { readModelCard } from './model-card';
import { expectRelClose } from '$lib/junction/test-helpers';

describe('readModelCard', () => {
	test('keeps the stated parameters with SPICE scale factors (ngspice User\'s Manual, §2.4.1: f, p, n, u, m, k, MEG, G)', () => {
		const r = readModelCard('* invented part\n.model LX2 D(IS=3.3p N=1.5\n+ RS=0.5k BV=1.2MEG IBV=10n TNOM=27)');
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.name).toBe('LX2');
		expectRelClose(r.model.IS, 3.3e-12, 1e-15);
		expect(r.model.RS).toBe(500);
		expect(r.model.BV).toBe(1.2e6);
		expectRelClose(r.model.IBV!, 1e-8, 1e-15);
		expect(r.model.TNOM).toBe(27);
		expect(Object.keys(r.model).sort()).toEqual(['BV', 'IBV', 'IS', 'N', 'RS', 'TNOM']);
	});

	test('N is SPICE\'s default 1 when the card leaves it out, and marked as not given', () => {
		const r = readModelCard('.model Y D(IS=1e-14)');
		expect(r).toMatchObject({ ok: true, model: { IS: 1e-14, N: 1 } });
		if (r.ok) expect(r.given).not.toContain('N');
	});

	test('parameters the engine does not use are warned about, not kept', () => {
		const r = readModelCard('.model Z D(IS=1e-14 KF=1e-16)');
		expect(r.ok && r.warnings.some((w) => w.includes('KF'))).toBe(true);
		expect(r.ok && 'KF' in r.model).toBe(false);
	});

	test('refusals say what is wrong', () => {
		expect(readModelCard('.model Z D(N=1)')).toMatchObject({ ok: false, message: expect.stringMatching(/no IS/) });
		expect(readModelCard('.model A D(IS=1f)\n.model B D(IS=2f)')).toMatchObject({ ok: false, message: expect.stringMatching(/exactly one/) });
		expect(readModelCard('x'.repeat(20_001))).toMatchObject({ ok: false, message: expect.stringMatching(/characters long/) });
	});
});
