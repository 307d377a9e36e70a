import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { AUDIT_ACTIONS, auditHref, auditLabel, auditWords } from './audit-words';
import { REVIEW_ACTIONS } from './review-transitions';
import { RUN_ACTIONS } from './run-transitions';

/** Every action name the server records: literals on `action:` lines, and the two templated families. */
function recordedActions(): string[] {
	const found = new Set<string>();
	for (const file of readdirSync('src/lib/server').filter((f) => f.endsWith('.ts') && !f.endsWith('.spec.ts'))) {
		for (const line of readFileSync(`src/lib/server/${file}`, 'utf8').split('\n')) {
			if (!/\baction: /.test(line)) continue;
			for (const m of line.matchAll(/'([a-z]+\.[a-z-]+)'/g)) found.add(m[1]);
			if (line.includes('`review.${input.action}`')) for (const a of REVIEW_ACTIONS) found.add(`review.${a}`);
			if (line.includes('`run.${action}`')) for (const a of RUN_ACTIONS) found.add(`run.${a}`);
		}
	}
	return [...found].sort();
}

describe('the audit log in words', () => {
	test('every action the server records has a label and words (a new one fails here)', () => {
		const recorded = recordedActions();
		expect(recorded.length).toBeGreaterThan(20);
		expect(recorded.filter((a) => !(a in AUDIT_ACTIONS))).toEqual([]);
	});

	test('entries read as sentences about people and things, not codes', () => {
		const base = { entity: 'person', entityId: 'u1', subject: 'Ilse Varrow' };
		expect(auditWords({ ...base, action: 'person.deactivated', detail: { sessionsEnded: 1, tokensRevoked: 2 } })).toBe(
			'deactivated Ilse Varrow (1 session ended, 2 API tokens revoked)'
		);
		expect(auditWords({ ...base, action: 'role.granted', detail: { role: 'lead' } })).toBe('granted the lead role to Ilse Varrow');
		expect(auditWords({ action: 'review.request-changes', entity: 'project', entityId: '7', detail: { to: 'returned', comment: 'Add a quieter part.' } })).toBe(
			'sent the shortlist back for changes (“Add a quieter part.”)'
		);
		expect(auditWords({ action: 'review.approve', entity: 'project', entityId: '7', detail: { comment: '' } })).toBe('approved the shortlist');
		expect(auditWords({ action: 'shortlist.added', entity: 'project', entityId: '7', detail: { partNumber: 'QV-1', note: 'quietest hot' } })).toBe(
			'added QV-1 to the shortlist (“quietest hot”)'
		);
		expect(auditWords({ action: 'parts.import', entity: 'catalogue', entityId: '', detail: { created: [4, 5], updated: [9], unchanged: 3 } })).toBe(
			'imported a parts list: 2 new parts, 1 part changed, 3 unchanged'
		);
	});

	test('an action nobody wrote words for yet is still spelt out', () => {
		expect(auditWords({ action: 'widget.spun-up', entity: 'widget', entityId: '3', detail: {} })).toBe('widget spun up (widget 3)');
		expect(auditLabel('widget.spun-up')).toBe('widget spun up');
		expect(auditLabel('person.deactivated')).toBe('Person deactivated');
	});

	test('entries about parts, runs and projects link to their page', () => {
		expect(auditHref({ action: 'part.update', entity: 'part', entityId: '12', detail: {} })).toBe('/parts/12');
		expect(auditHref({ action: 'run.withdraw', entity: 'run', entityId: '5', detail: { partId: 12 } })).toBe('/parts/12');
		expect(auditHref({ action: 'project.created', entity: 'project', entityId: '3', detail: {} })).toBe('/projects/3');
		expect(auditHref({ action: 'token.revoked', entity: 'api-token', entityId: '9', detail: {} })).toBeNull();
	});
});
