// The demo catalogue: Marrowgate Instruments builds lab electrometers and keeps a shelf of
// junctions measured on its own curve tracer. Every maker and part number here is invented.
import type { JunctionKind, Material } from '../../src/lib/catalogue/vocabulary';

export type DemoPart = {
	key: string;
	partNumber: string;
	maker: string;
	kind: JunctionKind;
	material?: Material;
	package: string;
	admitsLight?: boolean;
	anodePins: string;
	cathodePins: string;
	ratings: { reverseV?: number; forwardA?: number; junctionC?: number };
	tags: string[];
	lifecycle?: 'in-use' | 'not-for-new' | 'retired';
	notes?: string;
	/** True physical parameters the sweeps are generated from (TNOM 25 °C). */
	truth: { IS: number; N: number; RS: number; RSH: number; EG?: number };
	/** Units measured at 25 °C; some also hot, some with a reverse leg. */
	samples: number;
	hot?: number;
	reverse?: boolean;
	/** A SPICE card given instead of (or before) measurements. */
	card?: string;
};

const M = {
	harrowby: 'Harrowby Semiconductor',
	quillon: 'Quillon Devices',
	tessaly: 'Tessaly Microworks',
	fenwick: 'Fenwick & Orme Silicon',
	calder: 'Calder Junction Works'
};

const p = (d: DemoPart) => d;

export const DEMO_PARTS: DemoPart[] = [
	// Low-leakage PN diodes: guard and clamp duty in the electrometer front end.
	p({ key: 'hrb-d10', partNumber: 'HRB-D10', maker: M.harrowby, kind: 'diode', package: 'SOD-323', anodePins: '2', cathodePins: '1', ratings: { reverseV: 75, forwardA: 0.2, junctionC: 150 }, tags: ['low-leakage', 'clamp'], truth: { IS: 2e-15, N: 1.02, RS: 1.2, RSH: 8e11 }, samples: 4, hot: 85, reverse: true }),
	p({ key: 'hrb-d12', partNumber: 'HRB-D12', maker: M.harrowby, kind: 'diode', package: 'SOT-23', anodePins: '1', cathodePins: '3', ratings: { reverseV: 100, forwardA: 0.25, junctionC: 150 }, tags: ['general'], truth: { IS: 4e-14, N: 1.06, RS: 0.8, RSH: 2e10 }, samples: 3, reverse: true }),
	p({ key: 'hrb-d20p', partNumber: 'HRB-D20P', maker: M.harrowby, kind: 'diode', package: 'SOT-23', anodePins: '1', cathodePins: '3', ratings: { reverseV: 30, forwardA: 0.05, junctionC: 125 }, tags: ['picoamp', 'low-leakage', 'guard'], truth: { IS: 1e-15, N: 1.01, RS: 6, RSH: 5e12 }, samples: 5, hot: 70, reverse: true, notes: 'Our default input-protection pair for the femtoamp range.' }),
	p({ key: 'hrb-d33', partNumber: 'HRB-D33', maker: M.harrowby, kind: 'diode', package: 'DO-35 glass', admitsLight: true, anodePins: 'A', cathodePins: 'K', ratings: { reverseV: 100, forwardA: 0.3, junctionC: 175 }, tags: ['glass', 'general'], truth: { IS: 3e-14, N: 1.08, RS: 0.6, RSH: 1e10 }, samples: 3, reverse: true }),
	p({ key: 'hrb-d40', partNumber: 'HRB-D40', maker: M.harrowby, kind: 'diode', package: 'SOD-123', anodePins: '2', cathodePins: '1', ratings: { reverseV: 200, forwardA: 1, junctionC: 150 }, tags: ['rectifier'], truth: { IS: 2e-9, N: 1.85, RS: 0.12, RSH: 2e9 }, samples: 3, lifecycle: 'not-for-new' }),
	p({ key: 'hrb-d41', partNumber: 'HRB-D41', maker: M.harrowby, kind: 'diode', package: 'SOD-123', anodePins: '2', cathodePins: '1', ratings: { reverseV: 400, forwardA: 1, junctionC: 150 }, tags: ['rectifier'], truth: { IS: 5e-9, N: 1.9, RS: 0.1, RSH: 1e9 }, samples: 2 }),
	p({ key: 'qvl-120', partNumber: 'QVL-120', maker: M.quillon, kind: 'diode', package: 'SOD-523', anodePins: '2', cathodePins: '1', ratings: { reverseV: 80, forwardA: 0.15, junctionC: 150 }, tags: ['switching', 'fast'], truth: { IS: 6e-14, N: 1.1, RS: 2.5, RSH: 6e10 }, samples: 3, hot: 85 }),
	p({ key: 'qvl-125', partNumber: 'QVL-125', maker: M.quillon, kind: 'diode', package: 'SOD-523', anodePins: '2', cathodePins: '1', ratings: { reverseV: 80, forwardA: 0.15, junctionC: 150 }, tags: ['switching', 'low-leakage'], truth: { IS: 8e-15, N: 1.04, RS: 3, RSH: 4e11 }, samples: 4, reverse: true }),
	p({ key: 'qvl-180', partNumber: 'QVL-180L', maker: M.quillon, kind: 'diode', package: 'SOT-323', anodePins: '1', cathodePins: '3', ratings: { reverseV: 50, forwardA: 0.1, junctionC: 125 }, tags: ['picoamp', 'guard'], truth: { IS: 2.5e-15, N: 1.03, RS: 9, RSH: 2e12 }, samples: 3, reverse: true }),
	p({ key: 'fwo-d7', partNumber: 'FWO-D7', maker: M.fenwick, kind: 'diode', package: 'MELF glass', admitsLight: true, anodePins: 'A', cathodePins: 'K', ratings: { reverseV: 150, forwardA: 0.5, junctionC: 175 }, tags: ['glass', 'high-voltage'], truth: { IS: 1.2e-13, N: 1.3, RS: 0.5, RSH: 5e9 }, samples: 3, hot: 100, reverse: true }),
	p({ key: 'fwo-d9', partNumber: 'FWO-D9', maker: M.fenwick, kind: 'diode', package: 'SOD-323', anodePins: '2', cathodePins: '1', ratings: { reverseV: 40, forwardA: 0.1, junctionC: 125 }, tags: ['general'], truth: { IS: 1e-14, N: 1.05, RS: 4, RSH: 1e11 }, samples: 1 }),
	p({ key: 'cjw-r2', partNumber: 'CJW-R2', maker: M.calder, kind: 'diode', package: 'SMA', anodePins: '2', cathodePins: '1', ratings: { reverseV: 600, forwardA: 2, junctionC: 150 }, tags: ['rectifier', 'power'], truth: { IS: 1e-8, N: 2, RS: 0.1, RSH: 1e9 }, samples: 3, lifecycle: 'retired' }),

	// Metal–semiconductor diodes.
	p({ key: 'qvl-s30', partNumber: 'QVL-S30', maker: M.quillon, kind: 'schottky', package: 'SOD-323', anodePins: '2', cathodePins: '1', ratings: { reverseV: 30, forwardA: 0.2, junctionC: 125 }, tags: ['low-drop', 'clamp'], truth: { IS: 2e-8, N: 1.05, RS: 1.5, RSH: 1e9 }, samples: 4, hot: 85, reverse: true }),
	p({ key: 'qvl-s31', partNumber: 'QVL-S31', maker: M.quillon, kind: 'schottky', package: 'SOD-523', anodePins: '2', cathodePins: '1', ratings: { reverseV: 30, forwardA: 0.1, junctionC: 125 }, tags: ['low-drop'], truth: { IS: 5e-9, N: 1.04, RS: 3.5, RSH: 3e9 }, samples: 3 }),
	p({ key: 'txy-s4', partNumber: 'TXY-S4', maker: M.tessaly, kind: 'schottky', package: 'SOT-23', anodePins: '1', cathodePins: '3', ratings: { reverseV: 40, forwardA: 0.2, junctionC: 125 }, tags: ['low-drop', 'dual'], truth: { IS: 8e-9, N: 1.07, RS: 2, RSH: 2e9 }, samples: 3, reverse: true }),
	p({ key: 'txy-s7', partNumber: 'TXY-S7H', maker: M.tessaly, kind: 'schottky', package: 'SOD-123', anodePins: '2', cathodePins: '1', ratings: { reverseV: 70, forwardA: 0.5, junctionC: 150 }, tags: ['high-barrier', 'low-leakage'], truth: { IS: 3e-10, N: 1.03, RS: 0.9, RSH: 5e10 }, samples: 4, hot: 85, reverse: true }),
	p({ key: 'fwo-s2', partNumber: 'FWO-S2', maker: M.fenwick, kind: 'schottky', package: 'SMA', anodePins: '2', cathodePins: '1', ratings: { reverseV: 40, forwardA: 1, junctionC: 125 }, tags: ['power', 'low-drop'], truth: { IS: 1e-8, N: 1.1, RS: 0.15, RSH: 1e9 }, samples: 2 }),
	p({ key: 'cjw-s5', partNumber: 'CJW-S5', maker: M.calder, kind: 'schottky', package: 'SOD-323', anodePins: '2', cathodePins: '1', ratings: { reverseV: 20, forwardA: 0.1, junctionC: 125 }, tags: ['detector'], truth: { IS: 1e-8, N: 1.12, RS: 12, RSH: 1e9 }, samples: 3 }),
	p({ key: 'hrb-s1', partNumber: 'HRB-S1', maker: M.harrowby, kind: 'schottky', package: 'SOD-523', anodePins: '2', cathodePins: '1', ratings: { reverseV: 15, forwardA: 0.05, junctionC: 125 }, tags: ['detector', 'zero-bias'], truth: { IS: 6e-9, N: 1.08, RS: 18, RSH: 1e9 }, samples: 0, card: '.model HRBS1 D(IS=6n N=1.08 RS=18 CJO=0.9p M=0.35 EG=0.69 XTI=2)' }),

	// Transistor base–emitter junctions (collector open).
	p({ key: 'txy-n3', partNumber: 'TXY-N3', maker: M.tessaly, kind: 'bjt-be', package: 'SOT-23', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 6, forwardA: 0.01, junctionC: 150 }, tags: ['npn', 'log-amp'], truth: { IS: 6e-15, N: 1.01, RS: 8, RSH: 5e11 }, samples: 4, hot: 85, reverse: true }),
	p({ key: 'txy-n5', partNumber: 'TXY-N5', maker: M.tessaly, kind: 'bjt-be', package: 'SOT-323', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 5, forwardA: 0.005, junctionC: 150 }, tags: ['npn', 'matched'], truth: { IS: 3e-15, N: 1.005, RS: 15, RSH: 1e12 }, samples: 3, reverse: true }),
	p({ key: 'txy-p3', partNumber: 'TXY-P3', maker: M.tessaly, kind: 'bjt-be', package: 'SOT-23', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 5, forwardA: 0.01, junctionC: 150 }, tags: ['pnp'], truth: { IS: 1.5e-14, N: 1.02, RS: 6, RSH: 3e11 }, samples: 3 }),
	p({ key: 'cjw-b8', partNumber: 'CJW-B8', maker: M.calder, kind: 'bjt-be', package: 'TO-92', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 6, forwardA: 0.02, junctionC: 150 }, tags: ['npn', 'general'], truth: { IS: 2e-14, N: 1.03, RS: 4, RSH: 1e11 }, samples: 3, hot: 60 }),
	p({ key: 'fwo-b2', partNumber: 'FWO-B2', maker: M.fenwick, kind: 'bjt-be', package: 'SOT-23', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 5, forwardA: 0.01, junctionC: 150 }, tags: ['npn'], truth: { IS: 1e-14, N: 1.02, RS: 10, RSH: 2e11 }, samples: 2, lifecycle: 'not-for-new' }),
	p({ key: 'qvl-b6', partNumber: 'QVL-B6', maker: M.quillon, kind: 'bjt-be', package: 'SOT-563', anodePins: 'B1', cathodePins: 'E1', ratings: { reverseV: 6, forwardA: 0.01, junctionC: 150 }, tags: ['npn', 'dual', 'matched'], truth: { IS: 4e-15, N: 1.01, RS: 12, RSH: 6e11 }, samples: 3, reverse: true }),
	p({ key: 'hrb-b9', partNumber: 'HRB-B9', maker: M.harrowby, kind: 'bjt-be', package: 'SOT-23', anodePins: 'B', cathodePins: 'E', ratings: { reverseV: 6, forwardA: 0.01 }, tags: ['npn'], truth: { IS: 8e-15, N: 1.02, RS: 9, RSH: 3e11 }, samples: 0, card: '.model HRBB9 D(IS=8f N=1.02 RS=9 EG=1.11 XTI=3)' }),

	// Transistors wired as diodes (collector tied to base): the picoamp log element.
	p({ key: 'txy-n3d', partNumber: 'TXY-N3D', maker: M.tessaly, kind: 'bjt-diode', package: 'SOT-23', anodePins: 'B+C', cathodePins: 'E', ratings: { reverseV: 6, forwardA: 0.01, junctionC: 150 }, tags: ['npn', 'log-amp', 'picoamp'], truth: { IS: 6e-15, N: 1.0, RS: 6, RSH: 8e11 }, samples: 4, hot: 85, reverse: true }),
	p({ key: 'cjw-b8d', partNumber: 'CJW-B8D', maker: M.calder, kind: 'bjt-diode', package: 'TO-92', anodePins: 'B+C', cathodePins: 'E', ratings: { reverseV: 6, forwardA: 0.02, junctionC: 150 }, tags: ['npn', 'temperature-sensor'], truth: { IS: 2e-14, N: 1.002, RS: 3, RSH: 2e11 }, samples: 3, hot: 60 }),
	p({ key: 'qvl-b6d', partNumber: 'QVL-B6D', maker: M.quillon, kind: 'bjt-diode', package: 'SOT-563', anodePins: 'B1+C1', cathodePins: 'E1', ratings: { reverseV: 6, forwardA: 0.01, junctionC: 150 }, tags: ['matched', 'log-amp'], truth: { IS: 4e-15, N: 1.001, RS: 10, RSH: 1e12 }, samples: 3, reverse: true }),
	p({ key: 'fwo-b4d', partNumber: 'FWO-B4D', maker: M.fenwick, kind: 'bjt-diode', package: 'SOT-23', anodePins: 'B+C', cathodePins: 'E', ratings: { reverseV: 5, forwardA: 0.01, junctionC: 150 }, tags: ['pnp', 'temperature-sensor'], truth: { IS: 1e-14, N: 1.004, RS: 7, RSH: 4e11 }, samples: 3 }),
	p({ key: 'hrb-b2d', partNumber: 'HRB-B2D', maker: M.harrowby, kind: 'bjt-diode', package: 'SOT-23', anodePins: 'B+C', cathodePins: 'E', ratings: { reverseV: 5, forwardA: 0.01, junctionC: 150 }, tags: ['npn'], truth: { IS: 7e-15, N: 1.003, RS: 8, RSH: 5e11 }, samples: 2 }),

	// JFET gate–channel junctions: the lowest leakage on the shelf.
	p({ key: 'cjw-g1', partNumber: 'CJW-G1', maker: M.calder, kind: 'jfet-gate', package: 'SOT-23', anodePins: 'G', cathodePins: 'S+D', ratings: { reverseV: 40, forwardA: 0.01, junctionC: 150 }, tags: ['n-channel', 'femtoamp', 'low-leakage'], truth: { IS: 1e-15, N: 1.1, RS: 20, RSH: 1e13 }, samples: 4, hot: 70, reverse: true, notes: 'Best input-protection leakage we have measured; handle with gloves.' }),
	p({ key: 'cjw-g2', partNumber: 'CJW-G2', maker: M.calder, kind: 'jfet-gate', package: 'TO-92', anodePins: 'G', cathodePins: 'S+D', ratings: { reverseV: 25, forwardA: 0.01, junctionC: 150 }, tags: ['n-channel', 'low-leakage'], truth: { IS: 3e-15, N: 1.15, RS: 15, RSH: 5e12 }, samples: 3, reverse: true }),
	p({ key: 'txy-g4', partNumber: 'TXY-G4', maker: M.tessaly, kind: 'jfet-gate', package: 'SOT-23', anodePins: 'G', cathodePins: 'S+D', ratings: { reverseV: 30, forwardA: 0.01, junctionC: 150 }, tags: ['n-channel'], truth: { IS: 8e-15, N: 1.2, RS: 12, RSH: 2e12 }, samples: 3 }),
	p({ key: 'qvl-g7', partNumber: 'QVL-G7', maker: M.quillon, kind: 'jfet-gate', package: 'SOT-323', anodePins: 'G', cathodePins: 'S+D', ratings: { reverseV: 25, forwardA: 0.005, junctionC: 125 }, tags: ['p-channel', 'femtoamp'], truth: { IS: 1.5e-15, N: 1.12, RS: 18, RSH: 8e12 }, samples: 3, hot: 60, reverse: true }),
	p({ key: 'fwo-g3', partNumber: 'FWO-G3', maker: M.fenwick, kind: 'jfet-gate', package: 'TO-18 metal can', anodePins: 'G', cathodePins: 'S+D', ratings: { reverseV: 50, forwardA: 0.01, junctionC: 175 }, tags: ['n-channel', 'metal-can', 'low-leakage'], truth: { IS: 2e-15, N: 1.08, RS: 10, RSH: 1e13 }, samples: 1, reverse: true }),

	// LEDs: wide band-gap, light-sensitive as detectors.
	p({ key: 'zlm-r1', partNumber: 'ZLM-R1', maker: M.tessaly, kind: 'led', package: '3 mm clear', anodePins: 'A', cathodePins: 'K', ratings: { reverseV: 5, forwardA: 0.02, junctionC: 100 }, tags: ['red', 'indicator'], truth: { IS: 1e-15, N: 1.9, RS: 8, RSH: 1e11, EG: 1.9 }, samples: 3, reverse: true }),
	p({ key: 'zlm-a2', partNumber: 'ZLM-A2', maker: M.tessaly, kind: 'led', package: '0603 water-clear', anodePins: '1', cathodePins: '2', ratings: { reverseV: 5, forwardA: 0.02, junctionC: 100 }, tags: ['amber', 'indicator'], truth: { IS: 3e-15, N: 1.95, RS: 10, RSH: 5e10, EG: 1.9 }, samples: 3 }),
	p({ key: 'hrb-l4', partNumber: 'HRB-L4', maker: M.harrowby, kind: 'led', package: '0805 diffused', anodePins: '1', cathodePins: '2', ratings: { reverseV: 5, forwardA: 0.03, junctionC: 100 }, tags: ['red', 'low-leakage', 'photodetector'], truth: { IS: 1e-15, N: 1.8, RS: 6, RSH: 5e12, EG: 1.9 }, samples: 4, hot: 60, reverse: true, notes: 'Used as a low-leakage clamp in the 6 V guard ring.' }),
	p({ key: 'fwo-l1', partNumber: 'FWO-L1', maker: M.fenwick, kind: 'led', package: '5 mm clear', anodePins: 'A', cathodePins: 'K', ratings: { reverseV: 5, forwardA: 0.02, junctionC: 100 }, tags: ['green'], truth: { IS: 1e-15, N: 2, RS: 12, RSH: 2e11, EG: 1.9 }, samples: 2 }),
	p({ key: 'cjw-l3', partNumber: 'CJW-L3', maker: M.calder, kind: 'led', package: '1206 clear', anodePins: '1', cathodePins: '2', ratings: { reverseV: 5, forwardA: 0.02 }, tags: ['red'], truth: { IS: 2e-15, N: 1.85, RS: 9, RSH: 1e11 }, samples: 0, card: '.model CJWL3 D(IS=2f N=1.85 RS=9 EG=1.9 XTI=3)' }),

	// A few more silicon parts so the catalogue is not all one page.
	p({ key: 'txy-d2', partNumber: 'TXY-D2', maker: M.tessaly, kind: 'diode', package: 'DFN1006', anodePins: '2', cathodePins: '1', ratings: { reverseV: 85, forwardA: 0.15, junctionC: 150 }, tags: ['switching', 'small'], truth: { IS: 2e-14, N: 1.07, RS: 1.8, RSH: 1e11 }, samples: 3, hot: 85 }),
	p({ key: 'txy-d6', partNumber: 'TXY-D6', maker: M.tessaly, kind: 'diode', package: 'SOT-23', anodePins: '1', cathodePins: '3', ratings: { reverseV: 70, forwardA: 0.2, junctionC: 150 }, tags: ['dual', 'low-leakage'], truth: { IS: 5e-15, N: 1.03, RS: 2, RSH: 8e11 }, samples: 3, reverse: true }),
	p({ key: 'cjw-d5', partNumber: 'CJW-D5', maker: M.calder, kind: 'diode', package: 'SOD-323', anodePins: '2', cathodePins: '1', ratings: { reverseV: 100, forwardA: 0.2, junctionC: 150 }, tags: ['general'], truth: { IS: 5e-14, N: 1.09, RS: 1, RSH: 3e10 }, samples: 3, card: '.model CJWD5 D(IS=40f N=1.1 RS=1.2 EG=1.11 XTI=3)' }),
	p({ key: 'qvl-d9', partNumber: 'QVL-D9', maker: M.quillon, kind: 'diode', package: 'SOD-882', anodePins: '2', cathodePins: '1', ratings: { reverseV: 50, forwardA: 0.1, junctionC: 125 }, tags: ['small', 'picoamp'], truth: { IS: 3e-15, N: 1.04, RS: 7, RSH: 3e12 }, samples: 3, reverse: true, hot: 85 })
];
