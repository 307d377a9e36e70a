import { describe, expect, test } from 'vitest';
import { leakageBudget, ratioWords, shortfalls, verdict, type Prediction } from './shortlist';

function prediction(worstA: number, drop?: { cold: number; hot: number }): Prediction {
	return {
		id: 1,
		partNumber: 'QX-1',
		kind: 'diode',
		leakageA: { typical: worstA / 2, worst: worstA },
		forwardDropV: drop ?? null,
		flags: [],
		modelVersion: 1
	} as unknown as Prediction;
}

describe('the leakage a requirement allows', () => {
	test('a leakage target is the budget itself', () => {
		expect(leakageBudget({ leakageTargetA: 1e-12 })).toBe(1e-12);
	});
	test('an allowed error across the source resistance allows V / R (Ohm’s law: 1 mV across 1 GΩ is 1 pA)', () => {
		expect(leakageBudget({ allowedErrorV: 1e-3, sourceResistanceOhm: 1e9 })).toBe(1e-12);
		expect(leakageBudget({ allowedErrorV: 5e-3, sourceResistanceOhm: 1e10 })).toBeCloseTo(5e-13, 25);
	});
	test('no budget without a limit, or with an error but no resistance', () => {
		expect(leakageBudget({})).toBeNull();
		expect(leakageBudget({ allowedErrorV: 1e-3 })).toBeNull();
		expect(leakageBudget({ allowedErrorV: 1e-3, sourceResistanceOhm: 0 })).toBeNull();
	});
});

describe('a part judged against the requirement', () => {
	test('leakage within the budget passes; above it fails, with the ratio', () => {
		expect(verdict(prediction(5e-13), { allowedErrorV: 1e-3, sourceResistanceOhm: 1e9 }).leakage).toEqual({ status: 'pass', worstA: 5e-13, targetA: 1e-12, ratio: 0.5 });
		const v = verdict(prediction(8.32e-12), { leakageTargetA: 1e-14 });
		expect(v.leakage.status).toBe('fail');
		expect(v.leakage.ratio).toBeCloseTo(832, 9);
		expect(v.overall).toBe('fail');
	});
	test('the drop is judged at the worse of the two temperature ends', () => {
		const v = verdict(prediction(1e-15, { cold: 0.72, hot: 0.61 }), { leakageTargetA: 1e-12, maxForwardDropV: 0.7 });
		expect(v.drop).toMatchObject({ status: 'fail', worstV: 0.72, limitV: 0.7 });
		expect(v.leakage.status).toBe('pass');
		expect(v.overall).toBe('fail');
	});
	test('with no limits there is nothing to judge', () => {
		expect(verdict(prediction(1e-12), {}).overall).toBe('unknown');
	});
});

describe('what a lead approves over', () => {
	const entry = (partNumber: string, p: Prediction | null, limits: Parameters<typeof verdict>[1]) => ({
		partId: partNumber.length,
		partNumber,
		prediction: p,
		verdict: p ? verdict(p, limits) : null
	});

	test('each miss says by how much, in words', () => {
		const limits = { leakageTargetA: 1e-14, maxForwardDropV: 0.7 };
		const list = shortfalls([
			entry('QV-LL', prediction(5e-15, { cold: 0.6, hot: 0.5 }), limits),
			entry('QV-HL', prediction(8.32e-12, { cold: 0.82, hot: 0.7 }), limits),
			entry('QV-NONE', null, limits)
		]);
		expect(list).toEqual([
			{ partId: 5, partNumber: 'QV-HL', reasons: ['leakage 8.32 pA is 832× the 10 fA allowed', 'forward drop 820 mV is over the 700 mV limit'] },
			{ partId: 7, partNumber: 'QV-NONE', reasons: ['no usable model, so nothing could be predicted'] }
		]);
	});

	test('nothing to confirm when every part meets the requirement', () => {
		expect(shortfalls([entry('QV-LL', prediction(5e-15), { leakageTargetA: 1e-14 })])).toEqual([]);
	});

	test('ratios are short: two figures below 100×, whole numbers to 1000×, then three figures grouped', () => {
		expect(ratioWords(832.4)).toBe('832×');
		expect(ratioWords(25626194)).toBe('25,600,000×');
		expect(ratioWords(1234.5)).toBe('1,230×');
		expect(ratioWords(1.4321)).toBe('1.4×');
		expect(ratioWords(12.5)).toBe('13×');
	});
});
