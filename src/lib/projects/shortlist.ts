/**
 * A shortlist entry judged against its project's requirement: the verdict on leakage and
 * forward drop, and the shortfalls a lead must see before approving. Pure, so the server
 * (to refuse an approval without a note) and the screens (to show what misses) agree.
 */
import { formatSI } from '$lib/junction/units';
import type { RankItem } from '$lib/schemas/rank';
import { flagText, nodeHasLimits, type NodeEntryPrediction, type NodeRequirement } from '$lib/schemas/node';

/** A ranking item for one part, with the model version the numbers came from. */
export type Prediction = Omit<RankItem, 'rank'> & { modelVersion: number };

export type PersonRef = { id: string; name: string; email: string };

/** The limits a requirement states (volts, amperes, ohms). */
export type Limits = {
	leakageTargetA?: number;
	allowedErrorV?: number;
	sourceResistanceOhm?: number;
	maxForwardDropV?: number;
	/** A protected node the shortlist is judged in (candidate positions take each listed part). */
	node?: NodeRequirement;
};

export type Verdict = {
	/** pass / fail against the leakage budget (worst case), or none when no budget is set. */
	leakage: { status: 'pass' | 'fail' | 'none'; worstA: number; targetA?: number; ratio?: number };
	/** pass / fail against the drop limit (worst of cold and hot), or none. */
	drop: { status: 'pass' | 'fail' | 'none'; worstV?: number; limitV?: number; marginV?: number };
	/** pass / fail in the requirement's protected node (its limits, the fault clamped), when it has one. */
	node?: { status: 'pass' | 'fail' | 'none'; flags: string[] };
	overall: 'pass' | 'fail' | 'unknown';
};

export type Entry = {
	id: number;
	partId: number;
	partNumber: string;
	maker: string;
	kind: string;
	note: string;
	addedBy: PersonRef | null;
	addedAt: Date;
	prediction: Prediction | null;
	/** The part in the requirement's protected node, when there is one. */
	node: NodeEntryPrediction | null;
	verdict: Verdict | null;
};

// The leakage budget is its own small module, so the browser's ranking worker can use it without the schemas.
export { leakageBudget } from './leakage-budget';
import { leakageBudget } from './leakage-budget';

/** Compares one prediction (and the part's figures in the requirement's node) with the requirement's limits. */
export function verdict(p: Prediction, r: Limits, node?: NodeEntryPrediction | null): Verdict {
	const budget = leakageBudget(r);
	const leakage: Verdict['leakage'] =
		budget !== null
			? { status: p.leakageA.worst <= budget ? 'pass' : 'fail', worstA: p.leakageA.worst, targetA: budget, ratio: p.leakageA.worst / budget }
			: { status: 'none', worstA: p.leakageA.worst };
	let drop: Verdict['drop'] = { status: 'none' };
	if (p.forwardDropV) {
		const worstV = p.forwardDropV.worst ?? Math.max(p.forwardDropV.cold, p.forwardDropV.hot);
		drop =
			r.maxForwardDropV !== undefined
				? { status: worstV <= r.maxForwardDropV ? 'pass' : 'fail', worstV, limitV: r.maxForwardDropV, marginV: r.maxForwardDropV - worstV }
				: { status: 'none', worstV };
	} else if (r.maxForwardDropV !== undefined) {
		drop = { status: 'none', limitV: r.maxForwardDropV };
	}
	const inNode = r.node ? nodeVerdict(r.node, node ?? null) : undefined;
	const statuses = [leakage.status, drop.status, ...(inNode ? [inNode.status] : [])];
	const overall = statuses.includes('fail') ? 'fail' : statuses.includes('pass') ? 'pass' : 'unknown';
	return { leakage, drop, ...(inNode ? { node: inNode } : {}), overall };
}

/** A part in the node: it fails when it misses a node limit or cannot be evaluated there. */
function nodeVerdict(n: NodeRequirement, p: NodeEntryPrediction | null): NonNullable<Verdict['node']> {
	if (!p) return { status: 'fail', flags: [] };
	if (!p.meetsLimits) return { status: 'fail', flags: p.flags };
	return { status: nodeHasLimits(n) ? 'pass' : 'none', flags: p.flags };
}

const LARGE = new Intl.NumberFormat('en-GB', { maximumSignificantDigits: 3 });

/** "1.4×" for small ratios, "832×" from 100, "25,600,000×" for huge ones (three figures, grouped). */
export function ratioWords(x: number): string {
	if (x >= 1000) return `${LARGE.format(x)}×`;
	return x >= 100 ? `${Math.round(x)}×` : `${x.toPrecision(2)}×`;
}

/** One part that misses the requirement, or cannot be judged, with each reason in words. */
export type Shortfall = { partId: number; partNumber: string; reasons: string[] };

/**
 * What a lead approves over: every entry that fails a limit (how far, in words) or that has
 * no prediction at all. Empty when every part meets what the requirement states.
 */
export function shortfalls(entries: Pick<Entry, 'partId' | 'partNumber' | 'prediction' | 'verdict'>[]): Shortfall[] {
	const out: Shortfall[] = [];
	for (const e of entries) {
		if (!e.prediction || !e.verdict) {
			out.push({ partId: e.partId, partNumber: e.partNumber, reasons: ['no usable model, so nothing could be predicted'] });
			continue;
		}
		const reasons: string[] = [];
		const l = e.verdict.leakage;
		if (l.status === 'fail' && l.targetA !== undefined && l.ratio !== undefined)
			reasons.push(`leakage ${formatSI(l.worstA, 'A')} is ${ratioWords(l.ratio)} the ${formatSI(l.targetA, 'A')} allowed`);
		const d = e.verdict.drop;
		if (d.status === 'fail' && d.worstV !== undefined && d.limitV !== undefined)
			reasons.push(`forward drop ${formatSI(d.worstV, 'V')} is over the ${formatSI(d.limitV, 'V')} limit`);
		const n = e.verdict.node;
		if (n?.status === 'fail')
			reasons.push(n.flags.length ? `in the protected node: ${n.flags.map((f) => flagText(f).short).join(', ')}` : 'cannot be evaluated in the protected node');
		if (reasons.length) out.push({ partId: e.partId, partNumber: e.partNumber, reasons });
	}
	return out;
}
