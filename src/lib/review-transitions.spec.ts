import { describe, expect, test } from 'vitest';
import type { Actor, Role } from './permissions';
import { availableActions, checkTransition, REVIEW_ACTIONS, REVIEW_STATES, type ReviewAction, type ReviewState } from './review-transitions';

// The expected behaviour, written out independently of the implementation's table.
const EXPECTED_TARGET: Record<ReviewAction, Partial<Record<ReviewState, ReviewState>>> = {
	submit: { draft: 'in-review', returned: 'in-review' },
	approve: { 'in-review': 'approved' },
	'request-changes': { 'in-review': 'returned' },
	reject: { 'in-review': 'declined' }
};

type Person = { label: string; actor: Actor };
const person = (label: string, id: string, roles: Role[]): Person => ({ label, actor: { id, roles } });

const PEOPLE: Person[] = [
	{ label: 'anonymous', actor: null },
	person('no role', 'n', []),
	person('designer', 'd', ['designer']),
	person('second designer', 'd2', ['designer']),
	person('librarian', 'lib', ['librarian']),
	person('admin', 'adm', ['admin']),
	person('named lead', 'L', ['lead']),
	person('other lead', 'L2', ['lead']),
	person('designer who is also a lead', 'DL', ['designer', 'lead']),
	person('admin and librarian', 'AL', ['admin', 'librarian'])
];

const LEADS = [null, 'L'] as const;
const SUBMITTERS = [null, 'd', 'DL', 'L2'] as const;

function mayAct(p: Actor, action: ReviewAction, leadId: string | null, submittedBy: string | null): boolean {
	if (!p) return false;
	if (action === 'submit') return p.roles.includes('designer');
	if (!p.roles.includes('lead')) return false;
	if (leadId !== null && leadId !== p.id) return false;
	return submittedBy !== p.id;
}

describe('review transitions: every person × action × state × lead × submitter', () => {
	for (const p of PEOPLE) {
		for (const action of REVIEW_ACTIONS) {
			for (const state of REVIEW_STATES) {
				for (const leadId of LEADS) {
					for (const submittedBy of SUBMITTERS) {
						const allowedPerson = mayAct(p.actor, action, leadId, submittedBy);
						const target = EXPECTED_TARGET[action][state];
						const expected = !allowedPerson ? '403' : target ? `→ ${target}` : '409';
						test(`${p.label} · ${action} · from ${state} · lead ${leadId ?? 'any'} · submitted by ${submittedBy ?? 'nobody'} ⇒ ${expected}`, () => {
							const r = checkTransition(p.actor, action, state, { leadId, submittedBy });
							if (expected === '403') expect(r).toMatchObject({ ok: false, status: 403 });
							else if (expected === '409') expect(r).toMatchObject({ ok: false, status: 409 });
							else expect(r).toEqual({ ok: true, to: target });
						});
					}
				}
			}
		}
	}
});

describe('review transitions: explanations and buttons', () => {
	test('a lead deciding on their own submission is told why', () => {
		const r = checkTransition({ id: 'DL', roles: ['designer', 'lead'] }, 'approve', 'in-review', { leadId: null, submittedBy: 'DL' });
		expect(r).toMatchObject({ ok: false, status: 403, reason: expect.stringMatching(/own submission/) });
	});
	test('a lead who is not the named lead is told another lead decides', () => {
		const r = checkTransition({ id: 'L2', roles: ['lead'] }, 'reject', 'in-review', { leadId: 'L', submittedBy: 'd' });
		expect(r).toMatchObject({ ok: false, status: 403, reason: expect.stringMatching(/different lead/) });
	});
	test('an unknown state is refused as a conflict', () => {
		expect(checkTransition({ id: 'd', roles: ['designer'] }, 'submit', 'archived', { leadId: null, submittedBy: null })).toMatchObject({ ok: false, status: 409 });
	});
	test('buttons: a lead sees the three decisions on a submission, none on a draft', () => {
		const lead: Actor = { id: 'L', roles: ['lead'] };
		expect(availableActions(lead, 'in-review', { leadId: null, submittedBy: 'd' })).toEqual(['approve', 'request-changes', 'reject']);
		expect(availableActions(lead, 'draft', { leadId: null, submittedBy: null })).toEqual([]);
		expect(availableActions({ id: 'd', roles: ['designer'] }, 'returned', { leadId: null, submittedBy: 'd' })).toEqual(['submit']);
		expect(availableActions({ id: 'd', roles: ['designer'] }, 'approved', { leadId: null, submittedBy: 'd' })).toEqual([]);
	});
});
