/**
 * SPICE exports of parts: the one code path behind the part page's card, /parts/{id}/spice,
 * GET /api/v1/junctions/{id}/spice and the project's .lib (from its review snapshot). The
 * block itself is the engine's (src/lib/junction/spice-export.ts: a subcircuit with the
 * shunt and recombination term when there are any, a plain .model otherwise); this module
 * chooses the sample (typical, worst at an operating point, or a named unit) and writes
 * the comments that say what the block is.
 */
import {
	emitSpiceBlock,
	formatBias,
	formatSI,
	formatTemperature,
	shuntTce,
	spiceIdentifier,
	spiceNumber,
	worstSampleAt,
	type Evidence,
	type JunctionModel,
	type LabelledModel
} from '$lib/junction';
import { KIND_LABEL, type JunctionKind } from '$lib/catalogue/vocabulary';
import type { SampleChoice } from '$lib/schemas/spice';
import { DomainError } from './errors';
import * as catalogue from './catalogue';
import { loadPart, type CachedPart } from './model-cache';

/** What an export needs to know about a part and its models. */
export type SpicePart = {
	partNumber: string;
	maker: string;
	kind: JunctionKind;
	modelVersion: number;
	evidence: Evidence;
	givenSource: string | null;
	typical: JunctionModel;
	/** Measured samples with their units (none for a given model). */
	samples: LabelledModel[];
};

export type SpiceBlock = {
	/** The subcircuit or model name. */
	name: string;
	text: string;
	/** "typical" or the unit of the sample the block was made from. */
	sample: string;
};

/** A part from the model cache's own build of it (the models its predictions use). */
export function spicePartOf(part: CachedPart): SpicePart {
	return {
		partNumber: part.partNumber,
		maker: part.maker,
		kind: part.kind,
		modelVersion: part.modelVersion,
		evidence: part.evidence,
		givenSource: part.givenSource,
		typical: part.typicalModel,
		samples: part.evidence === 'measured' ? part.record.samples.map((model, i) => ({ unit: part.sampleUnits[i], model })) : []
	};
}

/** The chosen model and a sentence saying which it is. */
function choose(part: SpicePart, choice: SampleChoice): { model: JunctionModel; sample: string; says: string } {
	const n = part.samples.length;
	const none = `${part.partNumber} has no measured samples (its model is given, not measured), so only the typical model can be exported.`;
	if (choice.sample === 'typical') {
		const says =
			part.evidence === 'measured'
				? `typical model: median of ${n} measured sample${n === 1 ? '' : 's'}, each parameter on its own`
				: `given model, not measured (${part.givenSource ?? 'source not recorded'})`;
		return { model: part.typical, sample: 'typical', says };
	}
	if (n === 0) throw new DomainError(409, none, [{ path: 'sample', message: 'no measured samples' }]);
	if (choice.sample === 'worst') {
		const worst = worstSampleAt(part.samples, choice.biasV, choice.temperatureC)!;
		return {
			model: worst.model,
			sample: worst.unit,
			says: `sample ${worst.unit}: of the ${n} measured samples the one that leaks most at ${formatBias(choice.biasV)}, ${formatTemperature(choice.temperatureC)}`
		};
	}
	const found = part.samples.find((s) => s.unit === choice.unit);
	if (!found)
		throw new DomainError(404, `${part.partNumber} has no measured sample '${choice.unit}'; its samples are ${part.samples.map((s) => s.unit).join(', ')}.`, [
			{ path: 'sample', message: 'no such sample' }
		]);
	return { model: found.model, sample: found.unit, says: `sample ${found.unit}, one of ${n} measured` };
}

/**
 * The SPICE block of a part for a choice of sample, its name unique within `taken`
 * (a library's names so far) when given.
 * @throws DomainError 404 for an unknown unit, 409 when a given-model part is asked for a sample.
 */
export function spiceBlock(part: SpicePart, choice: SampleChoice, taken?: Set<string>): SpiceBlock {
	const { model, sample, says } = choose(part, choice);
	const name = spiceIdentifier(part.partNumber, taken);
	const comments = [`${part.partNumber} (${part.maker}, ${KIND_LABEL[part.kind]}), model version ${part.modelVersion}`, says];
	if (model.RSH !== undefined)
		comments.push(
			`shunt ${formatSI(model.RSH, 'Ω', { digits: 4 })} at TNOM ${formatTemperature(model.TNOM)}; its conductance rises x${spiceNumber(model.shuntFactorPer10K)} per 10 K (tce ${spiceNumber(shuntTce(model.shuntFactorPer10K))})`
		);
	if (model.ISR !== undefined && model.ISR > 0)
		comments.push('recombination current ISR/NR as a behavioural source, scaled with NR and kept in reverse bias as the prediction does');
	comments.push('pins: anode cathode. A model estimate from bench measurements of particular samples, not a guarantee.');
	return { name, text: emitSpiceBlock({ name, model, comments }), sample };
}

/**
 * A catalogue part's block, from its models as stored now (read straight from the
 * database, built as the ranking builds them).
 * @throws DomainError 404 when the part or its model does not exist, or as spiceBlock.
 */
export async function partSpiceBlock(id: number, choice: SampleChoice): Promise<SpiceBlock> {
	const { client } = await import('./db');
	const part = await loadPart(client, id);
	if (!part) {
		const exists = await catalogue.get(id);
		throw new DomainError(404, exists ? `${exists.partNumber} has no model yet.` : `No part ${id} in the catalogue.`);
	}
	return spiceBlock(spicePartOf(part), choice);
}

/** The response for a block: plain text, offered as a .lib file named after the part and sample. */
export function spiceResponse(block: SpiceBlock): Response {
	const file = `${block.name}${block.sample === 'typical' ? '' : `_${spiceIdentifier(block.sample)}`}.lib`;
	return new Response(block.text, {
		headers: { 'content-type': 'text/plain; charset=utf-8', 'content-disposition': `attachment; filename="${file}"` }
	});
}
