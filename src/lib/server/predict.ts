/**
 * Predictions for one model given by its SPICE parameters: current at each bias and
 * terminal voltage at each current, at one temperature (engine equations; exact SI constants).
 */
import { createModel, diodeCurrent, scaleModel, voltageAtCurrent } from '$lib/junction';
import type { PredictRequest } from '$lib/schemas/rank';
import { DomainError } from './errors';

export function predictModel(req: PredictRequest): { currentA: number[]; forwardV: number[] } {
	let model;
	try {
		model = createModel(req.model);
	} catch (e) {
		throw new DomainError(422, `The model is not usable: ${(e as Error).message}.`, [
			{ path: 'model', message: (e as Error).message }
		]);
	}
	const currentA = (req.biasV ?? []).map((v, i) => {
		try {
			return diodeCurrent(model, v, req.temperatureC);
		} catch (e) {
			throw new DomainError(422, `No current at biasV[${i}] = ${v} V: ${(e as Error).message}.`, [
				{ path: `biasV.${i}`, message: (e as Error).message }
			]);
		}
	});
	const scaled = (req.currentA?.length ?? 0) > 0 ? scaleModel(model, req.temperatureC) : null;
	const forwardV = (req.currentA ?? []).map((a, i) => {
		try {
			return voltageAtCurrent(scaled!, a);
		} catch (e) {
			throw new DomainError(422, `No voltage at currentA[${i}] = ${a} A: ${(e as Error).message}.`, [
				{ path: `currentA.${i}`, message: (e as Error).message }
			]);
		}
	});
	return { currentA, forwardV };
}
