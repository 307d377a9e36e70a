import { describe, expect, test } from 'vitest';
import type { Actor, Role } from './permissions';
import { availableRunActions, checkRunAction, RUN_ACTIONS, RUN_STATES, type RunAction, type RunState } from './run-transitions';

// The expected behaviour, written out independently of the implementation's table.
const EXPECTED_TARGET: Record<RunAction, Partial<Record<RunState, RunState>>> = {
	withdraw: { active: 'withdrawn' },
	refit: { active: 'active' },
	correct: { active: 'active' },
	reinstate: { withdrawn: 'active' }
};

const person = (label: string, roles: Role[]): { label: string; actor: Actor } => ({ label, actor: { id: label, roles } });
const PEOPLE = [
	{ label: 'anonymous', actor: null as Actor },
	person('no role', []),
	person('designer', ['designer']),
	person('librarian', ['librarian']),
	person('lead', ['lead']),
	person('admin', ['admin']),
	person('designer and librarian', ['designer', 'librarian']),
	person('admin and lead', ['admin', 'lead'])
];

describe('run transitions: every person × action × state', () => {
	for (const p of PEOPLE) {
		const librarian = p.actor?.roles.includes('librarian') ?? false;
		for (const action of RUN_ACTIONS) {
			for (const state of [...RUN_STATES, 'archived']) {
				const target = EXPECTED_TARGET[action][state as RunState];
				const expected = !librarian ? '403' : target ? `→ ${target}` : '409';
				test(`${p.label} · ${action} · from ${state} ⇒ ${expected}`, () => {
					const r = checkRunAction(p.actor, action, state);
					if (expected === '403') expect(r).toMatchObject({ ok: false, status: 403 });
					else if (expected === '409') expect(r).toMatchObject({ ok: false, status: 409 });
					else expect(r).toEqual({ ok: true, to: target });
				});
			}
		}
	}
});

describe('run transitions: explanations and forms', () => {
	const librarian: Actor = { id: 'l', roles: ['librarian'] };
	test('a withdrawn run says so when asked to withdraw again', () => {
		expect(checkRunAction(librarian, 'withdraw', 'withdrawn')).toMatchObject({ ok: false, status: 409, reason: expect.stringMatching(/withdrawn/) });
	});
	test('putting back an active run is refused in words', () => {
		expect(checkRunAction(librarian, 'reinstate', 'active')).toMatchObject({ ok: false, status: 409, reason: expect.stringMatching(/still counts/) });
	});
	test('a librarian sees three forms on an active run and one on a withdrawn run; a designer none', () => {
		expect(availableRunActions(librarian, 'active')).toEqual(['withdraw', 'refit', 'correct']);
		expect(availableRunActions(librarian, 'withdrawn')).toEqual(['reinstate']);
		expect(availableRunActions({ id: 'd', roles: ['designer'] }, 'active')).toEqual([]);
	});
});
