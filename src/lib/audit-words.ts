/**
 * The audit log in words: what each recorded action means, for the admin's audit page and
 * a project's activity list. Pure, so one table serves every screen.
 */

export type AuditFacts = {
	action: string;
	entity: string;
	entityId: string;
	detail: Record<string, unknown>;
	/** The name of the person the entry is about, for entries on a person. */
	subject?: string | null;
};

const str = (v: unknown, otherwise: string) => (typeof v === 'string' && v ? v : typeof v === 'number' ? String(v) : otherwise);
const quoted = (v: unknown) => (typeof v === 'string' && v ? ` (“${v}”)` : '');

type Entry = { label: string; words: (f: AuditFacts) => string };

/** Every action the app records, with the words for the filter list and for one entry. */
export const AUDIT_ACTIONS: Record<string, Entry> = {
	'part.create': { label: 'Part added', words: (f) => `added ${str(f.detail.partNumber, 'a part')} by ${str(f.detail.maker, 'an unnamed maker')} to the catalogue` },
	'part.update': { label: 'Part changed', words: (f) => `changed part ${f.entityId}${Array.isArray(f.detail.fields) ? ` (${f.detail.fields.join(', ')})` : ''}` },
	'parts.import': {
		label: 'Parts list imported',
		words: (f) => {
			const n = (v: unknown) => (Array.isArray(v) ? v.length : typeof v === 'number' ? v : 0); // ids stored, or a count
			const plural = (k: number, one: string) => `${k} ${one}${k === 1 ? '' : 's'}`;
			return `imported a parts list: ${plural(n(f.detail.created), 'new part')}, ${plural(n(f.detail.updated), 'part')} changed, ${n(f.detail.unchanged)} unchanged`;
		}
	},
	'part.model-card': { label: 'SPICE card imported', words: (f) => `imported the model card ${str(f.detail.name, '')} for part ${f.entityId}` },
	'sample.create': { label: 'Sample added', words: (f) => `added sample ${str(f.detail.unit, '')} to part ${str(f.detail.partId, '?')}` },
	'run.ingest': {
		label: 'Run uploaded',
		words: (f) => `stored run ${f.entityId} of sample ${str(f.detail.sample, '?')} (${str(f.detail.fileName, 'no file name')}) for part ${str(f.detail.partId, '?')}`
	},
	'project.created': { label: 'Project started', words: (f) => `started the project ${str(f.detail.name, f.entityId)}` },
	'run.withdraw': { label: 'Run withdrawn', words: (f) => `withdrew run ${f.entityId} of part ${str(f.detail.partId, '?')} from its model${quoted(f.detail.reason)}` },
	'run.reinstate': { label: 'Run put back', words: (f) => `put run ${f.entityId} of part ${str(f.detail.partId, '?')} back into its model${quoted(f.detail.reason)}` },
	'run.refit': { label: 'Run fitted again', words: (f) => `fitted run ${f.entityId} of part ${str(f.detail.partId, '?')} again${quoted(f.detail.reason)}` },
	'run.correct': { label: 'Run corrected', words: (f) => `corrected the sample or temperature of run ${f.entityId} of part ${str(f.detail.partId, '?')}${quoted(f.detail.reason)}` },
	'project.member-added': { label: 'Project member added', words: (f) => `added ${str(f.detail.email, 'someone')} as a member` },
	'project.member-removed': {
		label: 'Project member removed',
		words: (f) => `removed ${str(f.detail.name, str(f.detail.email, 'someone'))} from the project${f.detail.wasLead ? ' (they were its lead; any lead now decides)' : ''}`
	},
	'project.lead-changed': {
		label: 'Project lead changed',
		words: (f) => (f.detail.to ? `named ${str(f.detail.toName, str(f.detail.to, 'someone'))} the lead` : 'let any lead decide')
	},
	'project.node-set': { label: 'Protected node set', words: () => 'set the protected node the shortlist is judged in' },
	'project.node-removed': { label: 'Protected node taken out', words: () => 'took the protected node out of the requirement' },
	'shortlist.added': { label: 'Part put on a shortlist', words: (f) => `added ${str(f.detail.partNumber, 'a part')} to the shortlist${quoted(f.detail.note)}` },
	'shortlist.removed': { label: 'Part taken off a shortlist', words: (f) => `removed ${str(f.detail.partNumber, 'a part')} from the shortlist` },
	'review.submit': { label: 'Shortlist sent for review', words: () => 'sent the shortlist to the lead' },
	'review.approve': { label: 'Shortlist approved', words: (f) => decided(f, 'approve') },
	'review.request-changes': { label: 'Shortlist sent back', words: (f) => decided(f, 'request-changes') },
	'review.reject': { label: 'Shortlist declined', words: (f) => decided(f, 'reject') },
	'person.invited': { label: 'Person invited', words: (f) => `invited ${str(f.detail.email, f.subject ?? 'someone')}${roles(f.detail.roles)}` },
	'person.saved': { label: 'Person added', words: (f) => `added ${str(f.detail.email, f.subject ?? 'someone')}${roles(f.detail.roles)}` },
	'person.deactivated': {
		label: 'Person deactivated',
		words: (f) =>
			`deactivated ${f.subject ?? str(f.detail.email, 'someone')} (${counted(f.detail.sessionsEnded, 'session')} ended, ${counted(f.detail.tokensRevoked, 'API token')} revoked)`
	},
	'person.reactivated': { label: 'Person reactivated', words: (f) => `reactivated ${f.subject ?? str(f.detail.email, 'someone')}` },
	'role.granted': { label: 'Role granted', words: (f) => `granted the ${str(f.detail.role, '?')} role to ${f.subject ?? 'someone'}` },
	'role.revoked': { label: 'Role removed', words: (f) => `removed the ${str(f.detail.role, '?')} role from ${f.subject ?? 'someone'}` },
	'token.created': { label: 'API token created', words: (f) => `created the API token${quoted(f.detail.name)}` },
	'token.revoked': { label: 'API token revoked', words: (f) => `revoked API token ${f.entityId}` }
};

const DECIDED: Record<'approve' | 'request-changes' | 'reject', string> = {
	approve: 'approved the shortlist',
	'request-changes': 'sent the shortlist back for changes',
	reject: 'declined the shortlist'
};

function decided(f: AuditFacts, action: keyof typeof DECIDED): string {
	return `${DECIDED[action]}${quoted(f.detail.comment)}`;
}

function counted(v: unknown, noun: string): string {
	const n = typeof v === 'number' ? v : 0;
	return `${n} ${noun}${n === 1 ? '' : 's'}`;
}

function roles(v: unknown): string {
	return Array.isArray(v) && v.length ? ` as ${v.join(', ')}` : '';
}

/** One entry in words; an action this list does not know yet is spelt out from its name. */
export function auditWords(f: AuditFacts): string {
	const known = AUDIT_ACTIONS[f.action];
	return known ? known.words(f) : `${f.action.replace(/[.-]/g, ' ')} (${f.entity} ${f.entityId})`;
}

/** The label for the action filter. */
export function auditLabel(action: string): string {
	return AUDIT_ACTIONS[action]?.label ?? action.replace(/[.-]/g, ' ');
}

/** Where the thing an entry is about can be seen, if anywhere. */
export function auditHref(f: AuditFacts): string | null {
	if (f.entity === 'part') return `/parts/${f.entityId}`;
	if (f.entity === 'project') return `/projects/${f.entityId}`;
	if ((f.entity === 'run' || f.entity === 'sample') && typeof f.detail.partId === 'number') return `/parts/${f.detail.partId}`;
	return null;
}
