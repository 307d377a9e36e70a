/**
 * What a librarian may do to a stored measurement run, as pure data and one pure function
 * used by the server (to refuse) and the screens (to hide).
 *
 *   active ──withdraw──▶ withdrawn ──reinstate──▶ active
 *     │ ▲
 *     └─┘ refit, correct (the run stays active; each writes a new fit version)
 *
 * An active run counts toward its part's model; a withdrawn one does not, but keeps its
 * original file, every fit version and its history. Nothing is ever deleted.
 */
import { can, type Actor } from './permissions';

export const RUN_STATES = ['active', 'withdrawn'] as const;
export type RunState = (typeof RUN_STATES)[number];

export const RUN_ACTIONS = ['withdraw', 'refit', 'correct', 'reinstate'] as const;
export type RunAction = (typeof RUN_ACTIONS)[number];

type Transition = { from: readonly RunState[]; to: RunState; permission: 'catalogue:write' };

const RUN_TRANSITIONS: Record<RunAction, Transition> = {
	withdraw: { from: ['active'], to: 'withdrawn', permission: 'catalogue:write' },
	refit: { from: ['active'], to: 'active', permission: 'catalogue:write' },
	correct: { from: ['active'], to: 'active', permission: 'catalogue:write' },
	reinstate: { from: ['withdrawn'], to: 'active', permission: 'catalogue:write' }
};

/** Words people read for each state. */
export const RUN_STATE_LABEL: Record<RunState, string> = {
	active: 'Counts toward the model',
	withdrawn: 'Withdrawn'
};

/** Button words for each action. */
export const RUN_ACTION_LABEL: Record<RunAction, string> = {
	withdraw: 'Withdraw this run',
	refit: 'Fit again',
	correct: 'Record the correction',
	reinstate: 'Put it back into the model'
};

/** Past tense, for history lists. */
const RUN_ACTION_DONE: Record<RunAction, string> = {
	withdraw: 'withdrawn',
	refit: 'fitted again',
	correct: 'corrected',
	reinstate: 'put back into the model'
};

export function isRunState(s: string): s is RunState {
	return (RUN_STATES as readonly string[]).includes(s);
}

export type RunCheck = { ok: true; to: RunState } | { ok: false; status: 403 | 409; reason: string };

/** May this actor take this action on a run in this state? The person first (403), then the state (409). */
export function checkRunAction(actor: Actor, action: RunAction, state: string): RunCheck {
	const t = RUN_TRANSITIONS[action];
	if (!can(actor, t.permission)) return { ok: false, status: 403, reason: 'Only a librarian can change a stored run.' };
	if (!isRunState(state) || !t.from.includes(state)) {
		const reason =
			state === 'withdrawn'
				? action === 'withdraw'
					? 'The run is already withdrawn.'
					: `The run is withdrawn; put it back into the model before it can be ${RUN_ACTION_DONE[action]}.`
				: state === 'active'
					? 'The run still counts toward the model; there is nothing to put back.'
					: `The run is ${state}; it cannot be ${RUN_ACTION_DONE[action]} now.`;
		return { ok: false, status: 409, reason };
	}
	return { ok: true, to: t.to };
}

/** The actions this actor could take on a run right now (for showing forms). */
export function availableRunActions(actor: Actor, state: string): RunAction[] {
	return RUN_ACTIONS.filter((a) => checkRunAction(actor, a, state).ok);
}
