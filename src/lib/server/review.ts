/**
 * Review of a project's shortlist. Every transition is one transaction: a guarded update
 * of the project's state and version, a review event holding a snapshot of every entry's
 * predictions, an audit row and the outbound mail.
 */
import { and, desc, eq } from 'drizzle-orm';
import { db } from './db';
import { projects, reviewEvents, type Requirement } from './db/schema';
import { DomainError } from './api';
import { recordAudit } from './audit';
import { enqueueMail, type Mail } from './mail';
import * as people from './people';
import { escapeHtml } from './people';
import * as projectsDomain from './projects';
import { engineModel, type ModelRecord } from './project-predictions';
import { asciiText } from '$lib/junction';
import { JUNCTION_KINDS, type JunctionKind } from '$lib/catalogue/vocabulary';
import type { SampleChoice } from '$lib/schemas/spice';
import { spiceBlock, type SpiceBlock, type SpicePart } from './spice';
import type { Prediction, Verdict } from './projects';
import type { NodeEntryPrediction } from '$lib/schemas/node';
import { checkTransition, ACTION_DONE, STATE_LABEL, isReviewState, type ReviewAction, type ReviewState } from '$lib/review-transitions';
import type { ReviewResource } from '$lib/permissions';
import { formatSI, formatTemperature } from '$lib/junction/units';

export type SnapshotEntry = {
	partId: number;
	partNumber: string;
	maker: string;
	kind: string;
	note: string;
	addedBy: string | null;
	modelVersion: number;
	/** The typical model as it stood, so exports reproduce the decision. */
	model: ModelRecord | null;
	/** Each measured sample's model as it stood, and whether the part was measured (absent in records made before they were kept). */
	samples?: { unit: string; model: ModelRecord }[];
	evidence?: 'measured' | 'given';
	givenSource?: string | null;
	prediction: Prediction | null;
	/** The part in the requirement's protected node as it stood (absent in snapshots from before nodes). */
	node?: NodeEntryPrediction | null;
	verdict: Verdict | null;
};
export type Snapshot = { requirement: Requirement; entries: SnapshotEntry[] };

export type ReviewEvent = Omit<typeof reviewEvents.$inferSelect, 'snapshot'> & { snapshot: Snapshot; actorName: string };

export async function events(projectId: number): Promise<ReviewEvent[]> {
	const rows = await db.select().from(reviewEvents).where(eq(reviewEvents.projectId, projectId)).orderBy(desc(reviewEvents.at), desc(reviewEvents.id));
	const names = new Map<string, string>();
	for (const id of new Set(rows.map((r) => r.actorId).filter((x): x is string => !!x))) {
		const p = await people.findById(id);
		if (p) names.set(id, p.name);
	}
	return rows.map((r) => ({ ...r, snapshot: r.snapshot as Snapshot, actorName: r.actorId ? (names.get(r.actorId) ?? 'someone') : 'someone (since removed)' }));
}

/** Who sent the current round for review (the latest submission), if any. */
export function submitterOf(evts: ReviewEvent[]): string | null {
	return evts.find((e) => e.action === 'submit')?.actorId ?? null;
}

/** The latest decision (approve, request changes, decline), if any. */
export function latestDecision(evts: ReviewEvent[]): ReviewEvent | null {
	return evts.find((e) => e.action !== 'submit') ?? null;
}

export function resourceOf(project: projectsDomain.Project, evts: ReviewEvent[]): ReviewResource {
	return { leadId: project.leadId, submittedBy: project.state === 'in-review' ? submitterOf(evts) : null };
}

async function snapshotOf(project: projectsDomain.Project): Promise<Snapshot> {
	const { entries: current, models, parts } = await projectsDomain.evaluate(project);
	const versions = new Map((await projectsDomain.entryRows(project.id)).map((r) => [r.partId, r.modelVersion]));
	return {
		requirement: project.requirement,
		entries: current.map((e) => ({
			partId: e.partId,
			partNumber: e.partNumber,
			maker: e.maker,
			kind: e.kind,
			note: e.note,
			addedBy: e.addedBy?.name ?? null,
			modelVersion: e.prediction?.modelVersion ?? versions.get(e.partId) ?? 0,
			model: models.get(e.partId) ?? null,
			samples: parts.get(e.partId)?.samples ?? [],
			evidence: parts.get(e.partId)?.evidence ?? 'measured',
			givenSource: parts.get(e.partId)?.givenSource ?? null,
			prediction: e.prediction,
			node: e.node,
			verdict: e.verdict
		}))
	};
}

export type TransitionInput = { action: ReviewAction; comment: string; expectedVersion?: number };

/**
 * Moves the project along the review: checks the person (403) and the state (409), then
 * writes everything in one transaction whose update only succeeds if nobody acted first.
 */
export async function transition(projectId: number, input: TransitionInput, actor: App.User, origin: string) {
	const project = await projectsDomain.find(projectId);
	const evts = await events(projectId);
	const check = checkTransition(actor, input.action, project.state, resourceOf(project, evts));
	if (!check.ok) throw new DomainError(check.status, check.reason);
	if (input.expectedVersion !== undefined && input.expectedVersion !== project.version) {
		throw new DomainError(409, 'The project changed since you opened it; reload to see the latest before deciding.');
	}
	const snapshot = await snapshotOf(project);
	if (input.action === 'submit' && snapshot.entries.length === 0) {
		throw new DomainError(409, 'Add at least one part to the shortlist before sending it for review.');
	}
	const from = project.state as ReviewState;
	const to = check.to;
	const submitter = input.action === 'submit' ? actor.id : submitterOf(evts);

	return db.transaction(async (tx) => {
		const updated = await tx
			.update(projects)
			.set({ state: to, version: project.version + 1 })
			.where(and(eq(projects.id, projectId), eq(projects.state, from), eq(projects.version, project.version)))
			.returning({ version: projects.version });
		if (updated.length !== 1) {
			throw new DomainError(409, 'Someone acted on this project a moment ago; reload to see what was decided.');
		}
		const [event] = await tx
			.insert(reviewEvents)
			.values({ projectId, action: input.action, fromState: from, toState: to, projectVersion: updated[0].version, comment: input.comment, actorId: actor.id, snapshot })
			.returning();
		await recordAudit(tx, {
			actorId: actor.id,
			action: `review.${input.action}`,
			entity: 'project',
			entityId: projectId,
			detail: { from, to, comment: input.comment, eventId: event.id }
		});
		const link = `${origin.replace(/\/$/, '')}/projects/${projectId}`;
		let recipients: { email: string; name: string }[];
		if (input.action === 'submit') {
			recipients = project.leadId ? [await people.findById(project.leadId, tx)].filter((p): p is people.Person => !!p) : await people.listWithRole('lead', tx);
		} else {
			const list = await projectsDomain.members(projectId, tx);
			const sub = submitter ? await people.findById(submitter, tx) : null;
			recipients = sub ? [sub, ...list] : list;
		}
		const seen = new Set<string>([actor.email]);
		for (const r of recipients) {
			if (seen.has(r.email)) continue;
			seen.add(r.email);
			await enqueueMail(tx, composeMail({ to: r, actor, project, action: input.action, toState: to, comment: input.comment, snapshot, link }));
		}
		return { id: event.id, state: to, version: updated[0].version };
	});
}

export function describeRequirement(r: Requirement): string {
	const t = r.temperatureRangeC ? `${formatTemperature(r.temperatureRangeC[0])} to ${formatTemperature(r.temperatureRangeC[1])}` : formatTemperature(r.temperatureC ?? 25);
	const bits = [`bias ${formatSI(r.biasV, 'V')}`, t];
	if (r.leakageTargetA !== undefined) bits.push(`leakage target ${formatSI(r.leakageTargetA, 'A')}`);
	if (r.clampCurrentA !== undefined) bits.push(`clamp ${formatSI(r.clampCurrentA, 'A')}`);
	if (r.maxForwardDropV !== undefined) bits.push(`drop limit ${formatSI(r.maxForwardDropV, 'V')}`);
	if (r.node) bits.push(`in a protected node of ${r.node.junctions.length} junction${r.node.junctions.length === 1 ? '' : 's'} over ${formatSI(r.node.signalRangeV[0], 'V')} to ${formatSI(r.node.signalRangeV[1], 'V')}`);
	return bits.join(', ');
}

function entryLine(e: SnapshotEntry): string {
	if (!e.prediction || !e.verdict) return `${e.maker} ${e.partNumber}: no prediction (model missing)`;
	const v = e.verdict;
	const verdictWord = v.overall === 'pass' ? 'meets the requirement' : v.overall === 'fail' ? 'misses the requirement' : 'no limits to compare';
	const inNode = e.node ? `, worst net node current ${formatSI(Math.abs(e.node.netCurrentA.worst), 'A')}` : '';
	return `${e.maker} ${e.partNumber}: worst leakage ${formatSI(e.prediction.leakageA.worst, 'A')}${v.drop.worstV !== undefined ? `, worst drop ${formatSI(v.drop.worstV, 'V')}` : ''}${inNode} — ${verdictWord}`;
}

export function composeMail(m: {
	to: { email: string; name: string };
	actor: { name: string };
	project: { id: number; name: string };
	action: ReviewAction;
	toState: ReviewState;
	comment: string;
	snapshot: Snapshot;
	link: string;
}): Mail {
	const subject =
		m.action === 'submit'
			? `Shortlist for “${m.project.name}” awaits your decision`
			: `Shortlist for “${m.project.name}” ${ACTION_DONE[m.action]} by ${m.actor.name}`;
	const lead =
		m.action === 'submit'
			? `${m.actor.name} has sent the shortlist of “${m.project.name}” for your decision.`
			: `${m.actor.name} has ${ACTION_DONE[m.action]} the shortlist of “${m.project.name}”. It is now: ${STATE_LABEL[m.toState].toLowerCase()}.`;
	const lines = m.snapshot.entries.map(entryLine);
	const text = [
		`Hello ${m.to.name},`,
		'',
		lead,
		m.comment ? `\nComment:\n${m.comment}\n` : '',
		`Requirement: ${describeRequirement(m.snapshot.requirement)}`,
		'',
		'Shortlist at this moment:',
		...lines.map((l) => `  - ${l}`),
		'',
		`Open the project: ${m.link}`,
		'',
		'Predictions are model estimates from bench measurements of particular samples, not guarantees.'
	].join('\n');
	const html = `<p>Hello ${escapeHtml(m.to.name)},</p><p>${escapeHtml(lead)}</p>${m.comment ? `<blockquote>${escapeHtml(m.comment).replace(/\n/g, '<br>')}</blockquote>` : ''}<p>Requirement: ${escapeHtml(describeRequirement(m.snapshot.requirement))}</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join('')}</ul><p><a href="${escapeHtml(m.link)}">Open the project</a></p><p><small>Predictions are model estimates from bench measurements of particular samples, not guarantees.</small></p>`;
	return { to: m.to.email, subject, text, html };
}

/** Entries whose part model changed since the snapshot: old and new side by side. */
export type ChangedEntry = { partId: number; partNumber: string; then: SnapshotEntry; now: projectsDomain.Entry | null };

export function changedSince(snapshot: Snapshot, current: projectsDomain.Entry[]): ChangedEntry[] {
	const byPart = new Map(current.map((e) => [e.partId, e]));
	const out: ChangedEntry[] = [];
	for (const then of snapshot.entries) {
		const now = byPart.get(then.partId) ?? null;
		const nowVersion = now?.prediction?.modelVersion;
		if (now && nowVersion !== undefined && nowVersion !== then.modelVersion) out.push({ partId: then.partId, partNumber: then.partNumber, then, now });
	}
	return out;
}

function isJunctionKind(k: string): k is JunctionKind {
	return (JUNCTION_KINDS as readonly string[]).includes(k);
}

export function isDecided(state: string): boolean {
	return isReviewState(state) && (state === 'approved' || state === 'declined');
}


/** The approval event of an approved project (exports are made from its snapshot). */
export async function approval(projectId: number): Promise<{ project: projectsDomain.Project; event: ReviewEvent }> {
	const project = await projectsDomain.find(projectId);
	const evts = await events(projectId);
	const event = project.state === 'approved' ? evts.find((e) => e.action === 'approve') : undefined;
	if (!event) throw new DomainError(409, 'Only an approved shortlist can be exported; this one is not approved.');
	return { project, event };
}

/** The part behind a snapshot entry, as exports need it; null when no usable model was on record. */
function snapshotPart(e: SnapshotEntry): SpicePart | null {
	const typical = engineModel(e.model);
	if (!typical) return null;
	const samples = (e.samples ?? []).flatMap((s) => {
		const model = engineModel(s.model);
		return model ? [{ unit: s.unit, model }] : [];
	});
	return {
		partNumber: e.partNumber,
		maker: e.maker,
		kind: (isJunctionKind(e.kind) ? e.kind : 'diode') as JunctionKind,
		modelVersion: e.modelVersion,
		evidence: e.evidence ?? 'measured',
		givenSource: e.givenSource ?? null,
		typical,
		samples
	};
}

/** How the project's .lib chooses its samples: typical, or each part's worst at the requirement's hot end. */
export type LibraryChoice = 'typical' | 'worst';

/**
 * One SPICE block per approved part, from the models as they stood at approval (the same
 * code as the part page and the junction API). For `worst`, each part's sample that leaks
 * most at the requirement's bias and hottest temperature; a record that did not keep its
 * samples says so and gives the typical model.
 */
export function spiceBlocks(event: ReviewEvent, choice: LibraryChoice = 'typical'): { partId: number; block: SpiceBlock | null; note: string | null }[] {
	const taken = new Set<string>();
	const r = event.snapshot.requirement;
	const hot = r.temperatureRangeC ? r.temperatureRangeC[1] : (r.temperatureC ?? 25);
	return event.snapshot.entries.map((e) => {
		const part = snapshotPart(e);
		if (!part) return { partId: e.partId, block: null, note: `no usable model was on record for ${e.partNumber} at approval` };
		if (choice === 'worst' && part.samples.length === 0) {
			const why = part.evidence === 'given' ? 'its model is given, not measured' : 'this record did not keep the sample models';
			return { partId: e.partId, block: spiceBlock(part, { sample: 'typical' }, taken), note: `worst sample not available for ${e.partNumber} (${why}): typical model given` };
		}
		const sampleChoice: SampleChoice = choice === 'worst' ? { sample: 'worst', biasV: r.biasV, temperatureC: hot } : { sample: 'typical' };
		return { partId: e.partId, block: spiceBlock(part, sampleChoice, taken), note: null };
	});
}

/** The project's model library: a header, then each approved part's block (spiceBlocks). */
export function spiceLibrary(project: projectsDomain.Project, event: ReviewEvent, choice: LibraryChoice = 'typical'): string {
	const out = [
		`* Junctionary model library: project "${asciiText(project.name)}" (#${project.id})`,
		`* Approved by ${asciiText(event.actorName)} on ${event.at.toISOString()} (project version ${event.projectVersion})`,
		`* Requirement: ${asciiText(describeRequirement(event.snapshot.requirement))}`,
		`* Samples: ${choice === 'worst' ? "each part's sample that leaks most at the requirement's bias and hottest temperature" : 'typical models (median over measured samples)'}`,
		'* Predictions are model estimates from bench measurements of particular samples, not guarantees.',
		'* Leakage varies by lot, humidity, contamination and board layout (guarding matters).',
		''
	];
	const blocks = spiceBlocks(event, choice);
	event.snapshot.entries.forEach((e, i) => {
		const { block, note } = blocks[i];
		if (e.note) out.push(`* note on ${asciiText(e.partNumber)}: ${asciiText(e.note)}`);
		if (note) out.push(`* (${asciiText(note)})`);
		if (block) out.push(block.text);
		else out.push('');
	});
	return out.join('\n');
}

function csvCell(v: string | number | null | undefined): string {
	if (v === null || v === undefined) return '';
	const s = String(v);
	return /[",\n\r]/.test(s) || /^[=+\-@]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** The approved shortlist as CSV, SI base units in the headers. */
export function shortlistCsv(event: ReviewEvent): string {
	const head = [
		'part_number', 'maker', 'kind', 'note', 'added_by', 'model_version',
		'leakage_typical_A', 'leakage_worst_A', 'leakage_target_A', 'leakage_verdict',
		'drop_hot_V', 'drop_cold_V', 'drop_limit_V', 'drop_verdict', 'flags'
	];
	const rows = event.snapshot.entries.map((e) => [
		e.partNumber, e.maker, e.kind, e.note, e.addedBy, e.modelVersion,
		e.prediction?.leakageA.typical, e.prediction?.leakageA.worst, event.snapshot.requirement.leakageTargetA, e.verdict?.leakage.status,
		e.prediction?.forwardDropV?.hot, e.prediction?.forwardDropV?.cold, event.snapshot.requirement.maxForwardDropV, e.verdict?.drop.status,
		e.prediction?.flags.join(' ')
	]);
	return [head, ...rows].map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
