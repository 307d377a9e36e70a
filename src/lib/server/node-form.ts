/**
 * The node screen's typed fields turned into a node the API's schemas accept: part numbers
 * resolved to catalogue ids, then checked by the same schema the API uses, every problem put
 * back under the field it belongs to.
 */
import type { z } from 'zod';
import { fieldOfIssue, parseNodeFields, type NodeFieldErrors, type NodeFields } from '$lib/node/node-fields';
import { nodeRequestSchema, nodeRequirementSchema } from '$lib/schemas/node';
import { DomainError } from './errors';
import { partByNumber } from './projects';

type Schema = typeof nodeRequestSchema | typeof nodeRequirementSchema;

/**
 * The node the fields describe, checked by `schema` (nodeRequestSchema when every position
 * names a part, nodeRequirementSchema when some are candidates), or the errors by field.
 */
export async function nodeFromFields<S extends Schema>(fields: NodeFields, schema?: S): Promise<{ node?: z.infer<S>; candidates: boolean; errors: NodeFieldErrors }> {
	const { node, errors } = parseNodeFields(fields);
	if (!node) return { candidates: false, errors };
	const junctions = [];
	for (const [i, j] of node.junctions.entries()) {
		const { partNumber, ...rest } = j;
		if (partNumber === undefined) {
			junctions.push(rest);
			continue;
		}
		try {
			junctions.push({ ...rest, id: (await partByNumber(partNumber)).id });
		} catch (e) {
			if (!(e instanceof DomainError)) throw e;
			errors[`positions.${i}.part`] = e.issues?.[0]?.message ?? e.message;
		}
	}
	const candidates = junctions.some((j) => 'candidate' in j && j.candidate);
	if (Object.keys(errors).length) return { candidates, errors };
	const chosen = (schema ?? (candidates ? nodeRequirementSchema : nodeRequestSchema)) as S;
	const parsed = chosen.safeParse({ ...node, junctions });
	if (!parsed.success) {
		for (const issue of parsed.error.issues) errors[fieldOfIssue(issue.path.join('.'), fields)] ??= issue.message;
		return { candidates, errors };
	}
	return { node: parsed.data as z.infer<S>, candidates, errors };
}
