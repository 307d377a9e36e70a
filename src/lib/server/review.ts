/**
 * Review of a project's shortlist. Every transition is one transaction: a guarded update
 * of the project's state and version, a review event holding a snapshot of every entry's
 * predictions, an audit row and the outbound mail.
 */
import { and, desc, eq } from 'drizzle-orm';
import { db } from './db';
import { projects, reviewEvents, type Requirement } from './db/schema';
import { DomainError } from './errors';
import { recordAudit } from './audit';
import { enqueueMail, type Mail } from './mail';
import * as people from './people';
import { escapeHtml } from './people';
import * as projectsDomain from './projects';
import { engineModel, type ModelRecord } from './project-predictions';
import { asciiText } from '$lib/junction';
import { JUNCTION_KINDS, kindLabel, type JunctionKind } from '$lib/catalogue/vocabulary';
import type { SampleChoice } from '$lib/schemas/spice';
import { spiceBlock, type SpiceBlock, type SpicePart } from './spice';
import { leakageBudget, shortfalls } from '$lib/projects/shortlist';
import type { Prediction, Verdict } from './projects';
import type { NodeEntryPrediction } from '$lib/schemas/node';
import { checkTransition, type ReviewAction, type ReviewState } from '$lib/review-transitions';
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
function submitterOf(evts: ReviewEvent[]): string | null {
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
	const misses = shortfalls(snapshot.entries);
	if (input.action === 'approve' && misses.length && input.comment.trim() === '') {
		const parts = misses.map((m) => m.partNumber).join(', ');
		const message = `${misses.length} of ${snapshot.entries.length} parts miss the requirement (${parts}); approving them needs a note saying why.`;
		throw new DomainError(422, message, [{ path: 'comment', message }]);
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
			await enqueueMail(tx, composeMail({ to: r, actor, project, action: input.action, toState: to, comment: input.comment, snapshot, link, namedLead: project.leadId !== null }));
		}
		return { id: event.id, state: to, version: updated[0].version };
	});
}

function describeRequirement(r: Requirement): string {
	const t = r.temperatureRangeC ? `${formatTemperature(r.temperatureRangeC[0])} to ${formatTemperature(r.temperatureRangeC[1])}` : formatTemperature(r.temperatureC ?? 25);
	const bits = [`bias ${formatSI(r.biasV, 'V')}`, t];
	if (r.leakageTargetA !== undefined) bits.push(`leakage target ${formatSI(r.leakageTargetA, 'A')}`);
	if (r.allowedErrorV !== undefined && r.sourceResistanceOhm)
		bits.push(`allowed error ${formatSI(r.allowedErrorV, 'V')} across ${formatSI(r.sourceResistanceOhm, 'Ω')} (leakage up to ${formatSI(r.allowedErrorV / r.sourceResistanceOhm, 'A')})`);
	else if (r.sourceResistanceOhm) bits.push(`source resistance ${formatSI(r.sourceResistanceOhm, 'Ω')}`);
	if (r.clampCurrentA !== undefined) bits.push(`clamp ${formatSI(r.clampCurrentA, 'A')}`);
	if (r.maxForwardDropV !== undefined) bits.push(`drop limit ${formatSI(r.maxForwardDropV, 'V')}`);
	if (r.node) bits.push(`in a protected node of ${r.node.junctions.length} junction${r.node.junctions.length === 1 ? '' : 's'} over ${formatSI(r.node.signalRangeV[0], 'V')} to ${formatSI(r.node.signalRangeV[1], 'V')}`);
	return bits.join(', ');
}

function entryLine(e: SnapshotEntry): string {
	const name = `${e.partNumber} (${e.maker})`;
	if (!e.prediction || !e.verdict) return `${name}: no prediction, as no usable model was on record`;
	const v = e.verdict;
	const inNode = e.node ? `, worst net node current ${formatSI(Math.abs(e.node.netCurrentA.worst), 'A')}` : '';
	const figures = `worst leakage ${formatSI(e.prediction.leakageA.worst, 'A')}${v.drop.worstV !== undefined ? `, worst drop ${formatSI(v.drop.worstV, 'V')}` : ''}${inNode}`;
	if (v.overall === 'fail') return `${name}: ${figures}; misses: ${shortfalls([e])[0]?.reasons.join('; ') ?? 'a limit'}`;
	return `${name}: ${figures}${v.overall === 'pass' ? '; meets the requirement' : ''}`;
}

/** The mail's opening, as a colleague would write it, and its subject. */
function opening(m: { actor: { name: string }; project: { name: string }; action: ReviewAction; namedLead: boolean }): { subject: string; lead: string } {
	const p = `“${m.project.name}”`;
	switch (m.action) {
		case 'submit':
			return {
				subject: `Shortlist for ${p} awaits your decision`,
				lead: `${m.actor.name} has finished the shortlist for ${p} and asks ${m.namedLead ? 'you' : 'a lead'} to decide on it: approve it, send it back for changes, or decline it.`
			};
		case 'approve':
			return {
				subject: `Shortlist for ${p} approved by ${m.actor.name}`,
				lead: `${m.actor.name} has approved the shortlist for ${p}. The model library, the CSV and the printable review record are now on the project page.`
			};
		case 'request-changes':
			return {
				subject: `Shortlist for ${p}: ${m.actor.name} asks for changes`,
				lead: `${m.actor.name} has looked at the shortlist for ${p} and sent it back: it needs changes before it can be decided. Edit the shortlist, then send it to the lead again.`
			};
		case 'reject':
			return {
				subject: `Shortlist for ${p} declined by ${m.actor.name}`,
				lead: `${m.actor.name} has declined the shortlist for ${p}. The decision is final; a new project can start from the same requirement.`
			};
	}
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
	/** A submission to the one lead the project names (otherwise every lead is asked). */
	namedLead?: boolean;
}): Mail {
	const { subject, lead } = opening({ ...m, namedLead: m.namedLead ?? false });
	const firstName = m.actor.name.split(' ')[0];
	const lines = m.snapshot.entries.map(entryLine);
	const text = [
		`Hello ${m.to.name},`,
		'',
		lead,
		...(m.comment ? ['', `${firstName} wrote:`, ...m.comment.split('\n').map((l) => `> ${l}`)] : []),
		'',
		`The requirement: ${describeRequirement(m.snapshot.requirement)}.`,
		'',
		`The shortlist as it stood (${lines.length} ${lines.length === 1 ? 'part' : 'parts'}):`,
		...lines.map((l) => `  - ${l}`),
		'',
		`Open the project: ${m.link}`,
		'',
		'Predictions are model estimates from bench measurements of particular samples, not guarantees.'
	].join('\n');
	const html = `<p>Hello ${escapeHtml(m.to.name)},</p><p>${escapeHtml(lead)}</p>${m.comment ? `<p>${escapeHtml(firstName)} wrote:</p><blockquote>${escapeHtml(m.comment).replace(/\n/g, '<br>')}</blockquote>` : ''}<p>The requirement: ${escapeHtml(describeRequirement(m.snapshot.requirement))}.</p><p>The shortlist as it stood:</p><ul>${lines.map((l) => `<li>${escapeHtml(l)}</li>`).join('')}</ul><p><a href="${escapeHtml(m.link)}">Open the project</a></p><p><small>Predictions are model estimates from bench measurements of particular samples, not guarantees.</small></p>`;
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

/**
 * A number as a file should carry it: seven significant figures (as the model exports),
 * written in the shortest form that reads back to them — 1e-14, not 1.0000000000000002e-14.
 */
function csvNumber(v: number): string {
	return Number.isFinite(v) ? String(Number(v.toPrecision(7))) : '';
}

function csvCell(v: string | number | null | undefined): string {
	if (v === null || v === undefined) return '';
	if (typeof v === 'number') return csvNumber(v);
	return /[",\n\r]/.test(v) || /^[=+\-@]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

/** The approved shortlist as CSV, SI base units in the headers, kinds as people read them. */
export function shortlistCsv(event: ReviewEvent): string {
	const r = event.snapshot.requirement;
	const head = [
		'part_number', 'maker', 'kind', 'note', 'added_by', 'model_version',
		'leakage_typical_A', 'leakage_worst_A', 'leakage_target_A', 'leakage_verdict',
		'drop_hot_V', 'drop_cold_V', 'drop_limit_V', 'drop_verdict', 'flags'
	];
	const rows = event.snapshot.entries.map((e) => [
		e.partNumber, e.maker, kindLabel(e.kind), e.note, e.addedBy, e.modelVersion,
		e.prediction?.leakageA.typical, e.prediction?.leakageA.worst, leakageBudget(r), e.verdict?.leakage.status,
		e.prediction?.forwardDropV?.hot, e.prediction?.forwardDropV?.cold, r.maxForwardDropV, e.verdict?.drop.status,
		e.prediction?.flags.join(' ')
	]);
	return [head, ...rows].map((row) => row.map(csvCell).join(',')).join('\r\n') + '\r\n';
}
