import { describe, expect, test } from 'vitest';
import { ACTIONS, ROLES, can, type Action, type Role, refusal } from './permissions';

// The intended grants, written out independently of the implementation's table.
const EXPECTED: Record<Action, Role[] | 'all'> = {
	'catalogue:read': 'all',
	'catalogue:write': ['librarian'],
	'rank:use': 'all',
	'project:read': 'all',
	'project:create': ['designer'],
	'shortlist:edit': ['designer'],
	'project:people': ['designer', 'lead'],
	'review:submit': ['designer'],
	'review:decide': ['lead'],
	'people:manage': ['admin'],
	'tokens:own': 'all'
};

const someone = (roles: Role[], id = 'u1') => ({ id, roles });

describe('can(): every role × every action', () => {
	for (const action of ACTIONS) {
		for (const role of ROLES) {
			const want = EXPECTED[action] === 'all' || (EXPECTED[action] as Role[]).includes(role);
			test(`${role} ${want ? 'may' : 'may not'} ${action}`, () => {
				expect(can(someone([role]), action)).toBe(want);
			});
		}
		test(`nobody signed in may not ${action}`, () => expect(can(null, action)).toBe(false));
		test(`a person without roles may not ${action}`, () => expect(can(someone([]), action)).toBe(false));
	}
});

describe('can(): roles add up', () => {
	test('a designer who is also a librarian may write the catalogue and create projects', () => {
		const both = someone(['designer', 'librarian']);
		expect(can(both, 'catalogue:write')).toBe(true);
		expect(can(both, 'project:create')).toBe(true);
		expect(can(both, 'people:manage')).toBe(false);
	});
});

describe('can(): deciding a review', () => {
	const lead = someone(['lead'], 'lead-1');
	const cases: [string, { leadId: string | null; submittedBy: string | null }, boolean][] = [
		['any lead decides when none is named', { leadId: null, submittedBy: 'd-1' }, true],
		['the named lead decides', { leadId: 'lead-1', submittedBy: 'd-1' }, true],
		['another lead may not when one is named', { leadId: 'lead-2', submittedBy: 'd-1' }, false],
		['nobody decides on their own submission', { leadId: 'lead-1', submittedBy: 'lead-1' }, false]
	];
	for (const [name, resource, want] of cases) test(name, () => expect(can(lead, 'review:decide', resource)).toBe(want));
	test('a designer never decides, even when named', () => {
		expect(can(someone(['designer'], 'lead-1'), 'review:decide', { leadId: 'lead-1', submittedBy: 'x' })).toBe(false);
	});
});

describe('refusal(): why, in words', () => {
	test('names the role an action needs and never shows a permission code', () => {
		for (const action of ACTIONS) {
			const text = refusal(someone(['designer']), action);
			expect(text).not.toMatch(/[a-z]+:[a-z]+/);
			expect(text.length).toBeGreaterThan(10);
		}
		expect(refusal(someone(['designer']), 'catalogue:write')).toBe('Adding and changing parts, samples and measurement runs needs the librarian role. If your work needs it, ask an admin to grant it.');
		expect(refusal(someone(['lead']), 'review:decide')).toMatch(/named lead/);
	});
});
