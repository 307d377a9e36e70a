// The invented parts seed/scale.ts grows the catalogue with ("LX-" numbers from the
// invented maker Tallowmere Devices), each a model given directly and scattered around
// physically sensible values per kind. Also used by tests that need a scaled catalogue.
export const SCALE_MAKER = 'Tallowmere Devices';
export const SCALE_TAG = 'scale-test';
const KINDS = ['diode', 'schottky', 'bjt-be', 'bjt-diode', 'jfet-gate', 'led'] as const;
// Typical centre values per kind: IS [A], N, RS [Ω], rated reverse voltage [V].
const CENTRE: Record<(typeof KINDS)[number], { IS: number; N: number; RS: number; VR: number; EG?: number; XTI?: number }> = {
	diode: { IS: 3e-12, N: 1.8, RS: 0.8, VR: 75 },
	schottky: { IS: 2e-8, N: 1.05, RS: 3, VR: 30 },
	'bjt-be': { IS: 2e-14, N: 1.0, RS: 8, VR: 6 },
	'bjt-diode': { IS: 1e-14, N: 1.0, RS: 4, VR: 6 },
	'jfet-gate': { IS: 5e-15, N: 1.3, RS: 20, VR: 30 },
	led: { IS: 1e-20, N: 2.0, RS: 6, VR: 5, EG: 2.0, XTI: 3 }
};

/** The i-th scale part (0-based), drawing from `rand` (uniform) and `normal` (standard normal). */
export function scalePart(i: number, rand: () => number, normal: () => number) {
	const kind = KINDS[i % KINDS.length];
	const c = CENTRE[kind];
	return {
		partNumber: `LX-${String(i + 1).padStart(5, '0')}${kind === 'led' ? 'L' : ''}`,
		maker: SCALE_MAKER,
		kind,
		package: ['SOD-323', 'SOT-23', 'DO-35 glass', 'TO-92', '0603 clear'][i % 5],
		anodePins: '1',
		cathodePins: '2',
		ratings: { reverseV: c.VR * (1 + 0.5 * rand()) },
		tags: [SCALE_TAG],
		notes: '',
		lifecycle: i % 17 === 0 ? ('not-for-new' as const) : ('in-use' as const),
		model: {
			IS: c.IS * Math.exp(1.2 * normal()),
			N: Math.min(2.2, Math.max(1, c.N * (1 + 0.04 * normal()))),
			RS: c.RS * Math.exp(0.3 * normal()),
			RSH: rand() < 0.5 ? 10 ** (9 + 4 * rand()) : undefined,
			...(c.EG ? { EG: c.EG, XTI: c.XTI } : {})
		},
		modelSource: 'scale test (invented)'
	};
}
