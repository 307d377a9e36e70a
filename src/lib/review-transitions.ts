/**
 * How a project's shortlist moves from a designer's choice to a team decision, as pure
 * data and one pure function used by the server (to refuse) and the screens (to hide).
 *
 *   draft ──submit──▶ in-review ──approve──────────▶ approved
 *     ▲                  │  ├────request-changes──▶ returned ──submit──▶ in-review
 *     │                  │  └────reject───────────▶ declined
 *
 * The shortlist can be edited only in `draft` and `returned`; `approved` and `declined`
 * are final.
 */
import { can, type Actor, type ReviewResource } from './permissions';

export const REVIEW_STATES = ['draft', 'in-review', 'returned', 'approved', 'declined'] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

export const REVIEW_ACTIONS = ['submit', 'approve', 'request-changes', 'reject'] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

type Transition = { from: readonly ReviewState[]; to: ReviewState; permission: 'review:submit' | 'review:decide' };

const TRANSITIONS: Record<ReviewAction, Transition> = {
	submit: { from: ['draft', 'returned'], to: 'in-review', permission: 'review:submit' },
	approve: { from: ['in-review'], to: 'approved', permission: 'review:decide' },
	'request-changes': { from: ['in-review'], to: 'returned', permission: 'review:decide' },
	reject: { from: ['in-review'], to: 'declined', permission: 'review:decide' }
};

/** Words people read for each state and action. */
export const STATE_LABEL: Record<ReviewState, string> = {
	draft: 'Being assembled',
	'in-review': 'Awaiting the lead',
	returned: 'Sent back for changes',
	approved: 'Approved',
	declined: 'Declined'
};

export const ACTION_LABEL: Record<ReviewAction, string> = {
	submit: 'Send to the lead',
	approve: 'Approve the shortlist',
	'request-changes': 'Send back for changes',
	reject: 'Decline'
};

/** Past tense, for activity lists and mail subjects. */
const ACTION_DONE: Record<ReviewAction, string> = {
	submit: 'sent for review',
	approve: 'approved',
	'request-changes': 'sent back for changes',
	reject: 'declined'
};

export const EDITABLE_STATES: readonly ReviewState[] = ['draft', 'returned'];

export function isReviewState(s: string): s is ReviewState {
	return (REVIEW_STATES as readonly string[]).includes(s);
}

export function isEditable(state: string): boolean {
	return (EDITABLE_STATES as readonly string[]).includes(state);
}

export type TransitionCheck =
	| { ok: true; to: ReviewState }
	| { ok: false; status: 403 | 409; reason: string };

/**
 * May this actor take this action on a project in this state? `resource` carries the
 * project's named lead (null = any lead) and who submitted the current round.
 * The person is checked first (403), then the state (409).
 */
export function checkTransition(
	actor: Actor,
	action: ReviewAction,
	state: string,
	resource: ReviewResource
): TransitionCheck {
	const t = TRANSITIONS[action];
	if (!can(actor, t.permission, resource)) {
		let reason = t.permission === 'review:submit' ? 'Only a designer can send a shortlist for review.' : 'Only a lead can decide on a shortlist.';
		if (t.permission === 'review:decide' && can(actor, 'review:decide')) {
			reason =
				resource.submittedBy !== null && resource.submittedBy === actor?.id
					? 'Nobody decides on their own submission; another lead must.'
					: 'This project names a different lead; only they can decide.';
		}
		return { ok: false, status: 403, reason };
	}
	if (!isReviewState(state) || !t.from.includes(state)) {
		return {
			ok: false,
			status: 409,
			reason: `The shortlist is ${isReviewState(state) ? STATE_LABEL[state].toLowerCase() : state}; it cannot be ${ACTION_DONE[action]} now.`
		};
	}
	return { ok: true, to: t.to };
}

/** The actions this actor could take right now (for showing buttons). */
export function availableActions(actor: Actor, state: string, resource: ReviewResource): ReviewAction[] {
	return REVIEW_ACTIONS.filter((a) => checkTransition(actor, a, state, resource).ok);
}
