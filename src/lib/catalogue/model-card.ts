// A SPICE `.model` card read into the catalogue's stored model: the one reading used by the
// new-part form, the edit page's import (in the browser for the preview, on the server to
// store) and the demo seed.
import { parseModelCard } from '$lib/junction';
import type { StoredModel } from './models';

export type CardReading =
	| { ok: true; name: string; model: StoredModel; given: string[]; warnings: string[] }
	| { ok: false; message: string };

/** Largest card text accepted [characters]: a maker's card is a few hundred. */
const CARD_LIMIT = 20_000;

/**
 * Reads exactly one diode `.model` card. Only the parameters the card states are kept (the
 * engine's defaults fill the rest when predicting); the catalogue's own shunt factor is not
 * a SPICE parameter and stays out.
 */
export function readModelCard(text: string): CardReading {
	if (text.length > CARD_LIMIT) return { ok: false, message: `the card is ${text.length} characters long; up to ${CARD_LIMIT} are read` };
	try {
		const parsed = parseModelCard(text);
		const model: Record<string, number> = {};
		const given = parsed.given.filter((k) => k !== 'shuntFactorPer10K');
		for (const k of given) {
			const v = (parsed.model as unknown as Record<string, number>)[k];
			if (typeof v === 'number') model[k] = v;
		}
		model.IS = parsed.model.IS;
		model.N = parsed.model.N;
		return { ok: true, name: parsed.name, model: model as StoredModel, given, warnings: parsed.warnings };
	} catch (e) {
		return { ok: false, message: e instanceof Error ? e.message : String(e) };
	}
}

/** The card a form sent: the pasted text, or else the text of the chosen file. */
export async function cardTextFrom(form: FormData): Promise<string> {
	const pasted = String(form.get('card') ?? '');
	if (pasted.trim()) return pasted;
	const file = form.get('cardFile');
	// A longer file is cut just past the limit, so the reading refuses it with its length.
	if (file instanceof File && file.size > 0) return await file.slice(0, CARD_LIMIT + 1).text();
	return '';
}
