import { describe, expect, test } from 'vitest';
import { checkLead, checkRemoval, deciders, type Person } from './project-people';
import { REVIEW_STATES } from './review-transitions';

const L1: Person = { id: 'L1', name: 'First Lead', roles: ['lead'] };
const L2: Person = { id: 'L2', name: 'Second Lead', roles: ['lead'] };
const DL: Person = { id: 'DL', name: 'Designing Lead', roles: ['designer', 'lead'] };
const D: Person = { id: 'D', name: 'Designer', roles: ['designer'] };

describe('who could decide', () => {
	test('a named lead alone; with none named every lead but the submitter', () => {
		expect(deciders([L1, L2, DL], { leadId: 'L1', submittedBy: 'D' }).map((p) => p.id)).toEqual(['L1']);
		expect(deciders([L1, L2, DL], { leadId: null, submittedBy: 'DL' }).map((p) => p.id)).toEqual(['L1', 'L2']);
		expect(deciders([D], { leadId: null, submittedBy: 'x' })).toEqual([]);
	});
});

describe('changing the lead', () => {
	// [case, state, new lead, submitter, leads, allowed]
	const cases: [string, string, string | null, string | null, Person[], boolean][] = [
		['another lead takes an open review', 'in-review', 'L2', 'D', [L1, L2], true],
		['any lead, when another lead exists', 'in-review', null, 'DL', [DL, L1], true],
		['the submitter cannot be named to decide their own review', 'in-review', 'DL', 'DL', [DL, L1], false],
		['any lead, when the only lead sent it', 'in-review', null, 'DL', [DL], false],
		['a person without the lead role decides nothing', 'in-review', 'D', 'DL', [DL], false]
	];
	for (const [name, state, leadId, submittedBy, leads, ok] of cases) test(name, () => expect(checkLead(state, leadId, submittedBy, leads).ok).toBe(ok));
	test('outside an open review the lead may be anyone the server accepts', () => {
		for (const state of REVIEW_STATES.filter((s) => s !== 'in-review')) expect(checkLead(state, 'DL', 'DL', [DL])).toEqual({ ok: true });
	});
	test('the refusal says why', () => {
		expect(checkLead('in-review', 'DL', 'DL', [DL])).toMatchObject({ status: 409, reason: expect.stringMatching(/own submission/) });
	});
});

describe('removing a member', () => {
	test('a member who is not the named lead may always leave', () => {
		expect(checkRemoval('in-review', D, { leadId: 'L1' }, 'D', [L1]).ok).toBe(true);
		expect(checkRemoval('in-review', L2, { leadId: 'L1' }, 'D', [L1, L2]).ok).toBe(true);
	});
	test('the named lead may leave an open review when another lead could decide', () => {
		expect(checkRemoval('in-review', L1, { leadId: 'L1' }, 'D', [L1, L2]).ok).toBe(true);
	});
	test('the last person who could decide an open review may not leave it', () => {
		const r = checkRemoval('in-review', L1, { leadId: 'L1' }, 'DL', [L1, DL]);
		expect(r).toMatchObject({ ok: false, status: 409, reason: expect.stringMatching(/last person who could decide/) });
	});
	test('before submission or after the decision the named lead may leave', () => {
		for (const state of REVIEW_STATES.filter((s) => s !== 'in-review')) expect(checkRemoval(state, L1, { leadId: 'L1' }, null, [L1]).ok).toBe(true);
	});
});
