import { endpoint } from '$lib/server/api';
import { DomainError } from '$lib/server/errors';
import { requirePermission } from '$lib/server/guards';
import { rankCatalogue } from '$lib/server/ranking';
import { rankSheet } from '$lib/server/rank-export';
import { sheetFormat, sheetResponse } from '$lib/server/sheets';
import { FIELD_PARAM, fieldsFromQuery, parseFields, queryFromOperatingPoint, screenMessage, type FieldName } from '$lib/rank/operating-point-url';
import { RANK_PAGE_ROWS } from '../limits';

/**
 * GET /rank/export?<the rank screen's address>&format=csv|xlsx: the listed ranking as a sheet,
 * its operating point stated above the table. An address the screen cannot read is a 400
 * naming each parameter and what was wrong with it.
 */
export const GET = endpoint(async (event) => {
	requirePermission(event, 'rank:use');
	const format = sheetFormat(event.url);
	const { op, errors } = parseFields(fieldsFromQuery(event.url.searchParams));
	if (!op) {
		const issues = Object.entries(errors).map(([field, message]) => ({ path: FIELD_PARAM[field as FieldName] ?? field, message: screenMessage(String(message)) }));
		throw new DomainError(400, `The ranking address cannot be read: ${issues.map((i) => `${i.path}: ${i.message}`).join(' ')}`, issues);
	}
	const result = await rankCatalogue(op, RANK_PAGE_ROWS);
	return sheetResponse(rankSheet(op, result, queryFromOperatingPoint(op).toString()), format, `junctionary-ranking-${new Date().toISOString().slice(0, 10)}`);
});
