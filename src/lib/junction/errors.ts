/**
 * Error types the engine throws for bad input data, shaped so a server can map
 * them to HTTP responses without parsing messages.
 */

/** One problem found in uploaded data. Rows are 1-based as in the file (header = row 1). */
export interface DataIssue {
	row?: number;
	column?: string;
	message: string;
}

function summarise(prefix: string, issues: DataIssue[]): string {
	const first = issues
		.slice(0, 3)
		.map((i) => `${i.row !== undefined ? `row ${i.row}` : ''}${i.column ? ` [${i.column}]` : ''}${i.row !== undefined || i.column ? ': ' : ''}${i.message}`)
		.join('; ');
	return `${prefix}: ${first}${issues.length > 3 ? ` (and ${issues.length - 3} more)` : ''}`;
}

/** The sweep file cannot be used; `issues` lists every problem found (HTTP 422). */
export class SweepError extends Error {
	readonly issues: DataIssue[];
	readonly status = 422;
	constructor(issues: DataIssue[]) {
		super(summarise('sweep rejected', issues));
		this.name = 'SweepError';
		this.issues = issues;
	}
}

/** The sweep file is larger than MAX_SWEEP_BYTES (HTTP 413). */
export class SweepTooLargeError extends Error {
	readonly status = 413;
	readonly sizeBytes: number;
	readonly limitBytes: number;
	constructor(sizeBytes: number, limitBytes: number) {
		super(`sweep file is ${sizeBytes} bytes; the limit is ${limitBytes} bytes`);
		this.name = 'SweepTooLargeError';
		this.sizeBytes = sizeBytes;
		this.limitBytes = limitBytes;
	}
}

/** The data are valid but cannot support a model fit; `reasons` says why (HTTP 422). */
export class FitError extends Error {
	readonly reasons: string[];
	readonly status = 422;
	constructor(reasons: string[]) {
		super(`cannot fit a junction model: ${reasons.join('; ')}`);
		this.name = 'FitError';
		this.reasons = reasons;
	}
}
