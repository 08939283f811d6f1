/**
 * Errors and warnings found while reading an SPI file, in one shape and one message format so the
 * upload screen and the server log show them alike.
 */

/** One problem in a file. `row` is the physical line number of the file (header = 1). */
export interface IngestIssue {
	/** File line number where the row starts (1 = header line). */
	row: number;
	/** Column header as written in the file, or null for problems of a whole row or file. */
	column: string | null;
	/** What is wrong, without the location (see `formatIngestIssue`). */
	message: string;
}

/**
 * Render an issue as one line of text: `row 7, column "height_um": height 2500 µm is outside ...`.
 * Used for logs and plain-text reports.
 * @example formatIngestIssue({ row: 1, column: null, message: 'file is empty' }) // 'row 1: file is empty'
 */
export function formatIngestIssue(issue: IngestIssue): string {
	const where =
		issue.column === null ? `row ${issue.row}` : `row ${issue.row}, column "${issue.column}"`;
	return `${where}: ${issue.message}`;
}

/** Collects the first `limit` issues and counts all of them. */
export interface IssueCollector {
	/** Record one issue (kept only while fewer than `limit` are stored). */
	add(issue: IngestIssue): void;
	/** Number of issues seen, including those not kept. */
	readonly count: number;
	/** Copy of the kept issues, in the order found. */
	list(): IngestIssue[];
}

/** How many issues of one kind a file report keeps; the rest are only counted. */
export const DEFAULT_ISSUE_LIMIT = 100;

/**
 * Create a collector that keeps the first `limit` issues and counts every issue, so a file with a
 * million bad rows does not build a million messages.
 * @throws RangeError when `limit` is not a non-negative integer.
 * @example
 * const errors = createIssueCollector(1);
 * errors.add({ row: 2, column: null, message: 'a' });
 * errors.add({ row: 3, column: null, message: 'b' });
 * errors.count // 2; errors.list().length // 1
 */
export function createIssueCollector(limit: number = DEFAULT_ISSUE_LIMIT): IssueCollector {
	if (!Number.isInteger(limit) || limit < 0) {
		throw new RangeError(
			`createIssueCollector requires a non-negative integer limit, got ${limit}`
		);
	}
	const kept: IngestIssue[] = [];
	let count = 0;
	return {
		add(issue) {
			count++;
			if (kept.length < limit) kept.push(issue);
		},
		get count() {
			return count;
		},
		list() {
			return kept.slice();
		}
	};
}
