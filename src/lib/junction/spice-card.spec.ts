import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { emitModelCard, parseModelCard, parseModelCards, parseSpiceNumber } from './spice-card';
import { createModel } from './model';
import { expectRelClose } from './test-helpers';
import { runNgspiceOp } from '../../../tests/reference/ngspice';

describe('SPICE numbers', () => {
	// Scale factors as in the SPICE2/3 user guides and the ngspice manual (§2.3); the next test asks ngspice itself.
	it.each([
		['1e-14', 1e-14],
		['10p', 1e-11],
		['10pA', 1e-11],
		['2.2MEG', 2.2e6],
		['3M', 3e-3],
		['3m', 3e-3],
		['4.7k', 4700],
		['1u', 1e-6],
		['5n', 5e-9],
		['7f', 7e-15],
		['1g', 1e9],
		['2t', 2e12],
		['0.7V', 0.7],
		['1mil', 25.4e-6]
	] as const)('%s = %s', (t, v) => expectRelClose(parseSpiceNumber(t), v, 1e-15));

	it('rejects non-numbers', () => {
		expect(() => parseSpiceNumber('abc')).toThrow(/expected a SPICE number/);
	});

	it('reads every scale factor as Debian ngspice reads it', () => {
		// Each value as a current source into 1 Ω: ngspice prints the voltage, i.e. the value it read.
		const texts = ['10p', '10pA', '2.2MEG', '3M', '3m', '4.7k', '1u', '5n', '7f', '1g', '2t', '1mil'];
		const netlist = texts.flatMap((t, k) => [`i${k} 0 n${k} dc ${t}`, `r${k} n${k} 0 1`]).join('\n');
		const got = runNgspiceOp({ netlist, prints: texts.map((_, k) => `v(n${k})`) });
		texts.forEach((t, k) => expectRelClose(parseSpiceNumber(t), got.get(`v(n${k})`)!, 1e-12));
	});
});

describe('.model cards', () => {
	it('parses continuation lines, comments, suffixes, aliases and unknown parameters', () => {
		const text = `* catalogue card
.MODEL dx1 d ( IS = 2.5f N=1.05   ; ideality from fit
+ RS=0.5 CJ0=4p pb=0.7 mj=0.35
+ bv=75 ibv=5u TT=4n  level=1 )
`;
		const c = parseModelCard(text);
		expect(c.name).toBe('dx1');
		expect(c.type).toBe('D');
		expectRelClose(c.model.IS, 2.5e-15, 1e-15);
		expect(c.model.N).toBe(1.05);
		expectRelClose(c.model.CJO as number, 4e-12, 1e-15);
		expect(c.model.VJ).toBe(0.7);
		expect(c.model.M).toBe(0.35);
		expect(c.model.BV).toBe(75);
		expectRelClose(c.model.IBV, 5e-6, 1e-15);
		expect(c.unknown).toEqual([
			{ name: 'TT', value: '4n' },
			{ name: 'LEVEL', value: '1' }
		]);
		expect(c.warnings.length).toBe(2);
		expect(c.given).toContain('CJO');
	});

	it('accepts cards without parentheses and several cards in one text', () => {
		const cards = parseModelCards('.model a D IS=1e-14 N=1\n.model b D(IS=2e-12, N=1.9, RSH=1G)\n');
		expect(cards.map((c) => c.name)).toEqual(['a', 'b']);
		expect(cards[1].model.RSH).toBe(1e9);
	});

	it.each([
		['', /found none/],
		['.model x Q(IS=1)', /only diode/],
		['.model x D(N=1)', /no IS/],
		['.model x D(IS=abc)', /IS expected a number/],
		['.model x D(IS=1e-14', /parenthesis/],
		['.model x D(IS)', /NAME=value/],
		['+ IS=1', /continuation/],
		['.model x D(IS=1e-14 N=-1)', /N must be/]
	] as const)('rejects %j', (text, msg) => {
		expect(() => parseModelCards(text)).toThrow(msg);
	});

	it('round-trips every model exactly (property)', () => {
		const arb = fc.record({
			IS: fc.double({ min: 1e-20, max: 1e-3, noNaN: true }),
			N: fc.double({ min: 0.5, max: 4, noNaN: true }),
			RS: fc.double({ min: 0, max: 1e3, noNaN: true }),
			RSH: fc.option(fc.double({ min: 1, max: 1e15, noNaN: true }), { nil: undefined }),
			ISR: fc.option(fc.double({ min: 1e-20, max: 1e-6, noNaN: true }), { nil: undefined }),
			BV: fc.option(fc.double({ min: 1, max: 1000, noNaN: true }), { nil: undefined }),
			CJO: fc.option(fc.double({ min: 1e-15, max: 1e-9, noNaN: true }), { nil: undefined }),
			TNOM: fc.double({ min: -50, max: 150, noNaN: true }).map((t) => t + 0), // −0 prints as 0
			material: fc.constantFrom('silicon' as const, 'schottky' as const)
		});
		fc.assert(
			fc.property(arb, (p) => {
				const m = createModel(p);
				const text = emitModelCard('m1', m);
				const back = parseModelCard(text, m.material).model;
				expect(back).toEqual(m);
				for (const line of text.split('\n')) expect(line.length).toBeLessThanOrEqual(78);
			})
		);
	});

	it('omits catalogue extensions for a simulator and keeps unknown parameters when asked', () => {
		const m = createModel({ IS: 1e-14, RSH: 1e9, shuntFactorPer10K: 1.8 });
		expect(emitModelCard('s', m, { forSimulator: true })).not.toMatch(/RSH/);
		expect(emitModelCard('s', m)).toMatch(/RSHF=1.8/);
		expect(emitModelCard('s', m, { extra: [{ name: 'TT', value: '4n' }] })).toMatch(/TT=4n/);
		expect(() => emitModelCard('bad name', m)).toThrow();
	});
});
