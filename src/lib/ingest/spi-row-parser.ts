/**
 * The SPI row parser: one file's pieces in, struct-of-arrays batches of checked pad rows out. It
 * composes four parts: tokenising (`spi-tokenizer.ts`: bytes or text → records → cells), field
 * mapping (`spi-field-map.ts`: header → canonical fields), validation (`spi-row-validation.ts`:
 * strict cells → canonical values, issues by line/column/field) and row assembly
 * (`spi-row-assembly.ts`: board inspections, aggregates, batches, the bad-row policy).
 */
import type { BoardAggregate } from './board-accumulator';
import type { Delimiter } from './detect-delimiter';
import { createIssueCollector, DEFAULT_ISSUE_LIMIT, type IngestIssue } from './ingest-issue';
import type { MappingProfile } from './mapping-profile';
import { DEFAULT_SPI_PARSE_LIMITS, type SpiParseLimits } from './parse-limits';
import { createTimestampParser } from './parse-timestamp';
import type { ResolvedHeader } from './resolve-header';
import { createRowAssembler } from './spi-row-assembly';
import type { BoardHeader, SpiRowBatch } from './spi-row-batch';
import { mapSpiHeader, serialFromFileName } from './spi-field-map';
import { createRowValidator, emptyCheckedRow, type RowValidator } from './spi-row-validation';
import { createSpiTokenizer } from './spi-tokenizer';
import { isValidTimeZone } from './zoned-time-to-utc';

/** Options of `createSpiRowParser`. */
export interface SpiRowParserOptions {
	profile: MappingProfile;
	/** Name of the uploaded/watched file (base name used for `serialFromFileName`). */
	fileName: string;
	/** Rows per emitted batch (default 8192). */
	batchSize?: number;
	/** Kept errors and warnings, each (default 100); all are counted. */
	issueLimit?: number;
	/** Budgets of the file (line length, columns, boards); `DEFAULT_SPI_PARSE_LIMITS` where absent. */
	limits?: Partial<SpiParseLimits>;
}

/** A board inspection with its figures over the accepted rows. */
export interface BoardInspection extends BoardHeader {
	aggregate: BoardAggregate;
}

/** Outcome of a whole file. */
export interface SpiParseSummary {
	/** True when the file may be committed: no file-level error, ≥ 1 accepted row, and either
	 * no row errors or the profile skips bad rows. */
	ok: boolean;
	fileName: string;
	/** Delimiter used (detected or from the profile); null when no header was read. */
	delimiter: Delimiter | null;
	/** Header as written (trimmed). */
	header: string[];
	/** Non-blank lines after the header (records). */
	dataRows: number;
	/** Rows that passed every check (imported only when `ok`). */
	rowsAccepted: number;
	/** Rows with at least one error. `rowsAccepted + rowsRejected = dataRows` unless a
	 * file-level error stopped reading. */
	rowsRejected: number;
	/** Total errors found; `errors` keeps the first `issueLimit`. */
	errorCount: number;
	errors: IngestIssue[];
	warningCount: number;
	warnings: IngestIssue[];
	/** Boards with aggregates, in order of first appearance (empty when the file is rejected). */
	boards: BoardInspection[];
}

/** A push-driven parser for one file. */
export interface SpiRowParser {
	/** Feed the next piece of the file (bytes or text); returns the batches completed by it. */
	push(chunk: Uint8Array | string): SpiRowBatch[];
	/** Signal end of file; returns the last batches. Further pushes are ignored. */
	end(): SpiRowBatch[];
	/** Boards seen so far (append-only list; index = `BoardHeader.index`). */
	boards(): readonly BoardHeader[];
	/** Counts, issues and boards; final after `end()`. */
	summary(): SpiParseSummary;
}

const DEFAULT_BATCH_SIZE = 8192;

/**
 * Create a streaming parser for one SPI export. Feed it chunks (`Uint8Array` bytes, decoded as
 * strict UTF-8, or strings) in file order; it keeps only the unfinished line between chunks, so
 * memory does not grow with file size (apart from one small record per board inspection).
 *
 * Per line: BOM and CR are dropped, blank lines skipped, lines without `"` split by `indexOf`
 * (fast path) and lines with quotes by an RFC 4180 reader (a quoted field may span lines).
 * The header is matched through the profile (`resolveHeader`); each row is checked for field
 * count, numbers (`FIELD_RANGES`, after unit conversion to µm / µm³), timestamp, result word,
 * non-empty serial / refdes / line / product, panel index as integer 0–65535, text ≤ 100 chars,
 * and that line / product / stencil / print run agree within a board inspection (serial +
 * time). Errors are `{ row, column, message }`, row = file line (header = 1; row 0 = the file
 * as a whole: empty, not UTF-8 text, NUL bytes, file name, no data rows).
 *
 * Policies: `skip-row` imports the good rows; `reject-file` stops emitting batches at the first
 * bad row but keeps validating to report errors. Whenever `summary().ok` is false after `end()`
 * (bad row under `reject-file`, or a file-level error found late, e.g. invalid bytes near the
 * end), the caller must roll back what it wrote from earlier batches (one transaction per file).
 *
 * @throws Error when the profile's timestamp pattern or time zone is invalid (validate profiles
 *   with `mappingProfileSchema` first), or `batchSize` is not a positive integer. Never throws on
 *   file content: that becomes errors in `summary()`, and so does a serial pattern RE2 refuses
 *   (a profile saved before patterns ran on RE2).
 * @example
 * const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'a.csv' });
 * for await (const chunk of stream) for (const batch of parser.push(chunk)) write(batch);
 * for (const batch of parser.end()) write(batch);
 * parser.summary().ok // true
 */
export function createSpiRowParser(options: SpiRowParserOptions): SpiRowParser {
	const { profile, fileName } = options;
	const batchSize = options.batchSize ?? DEFAULT_BATCH_SIZE;
	if (!Number.isInteger(batchSize) || batchSize < 1) {
		throw new RangeError(
			`createSpiRowParser requires a positive integer batchSize, got ${batchSize}`
		);
	}
	// Fail at creation, not on the first row without an offset.
	if (!isValidTimeZone(profile.timeZone)) {
		throw new RangeError(`createSpiRowParser: unknown time zone "${profile.timeZone}"`);
	}
	const parseTime = createTimestampParser(profile.timestampFormat, profile.timeZone);
	const issueLimit = options.issueLimit ?? DEFAULT_ISSUE_LIMIT;
	// Budgets, counted before the work they bound (see parse-limits.ts).
	const limits: SpiParseLimits = {
		maxLineBytes: options.limits?.maxLineBytes ?? DEFAULT_SPI_PARSE_LIMITS.maxLineBytes,
		maxColumns: options.limits?.maxColumns ?? DEFAULT_SPI_PARSE_LIMITS.maxColumns,
		maxBoards: options.limits?.maxBoards ?? DEFAULT_SPI_PARSE_LIMITS.maxBoards
	};
	for (const name of ['maxLineBytes', 'maxColumns', 'maxBoards'] as const) {
		const value = limits[name];
		if (!Number.isSafeInteger(value) || value < 1) {
			throw new RangeError(`createSpiRowParser requires a positive integer ${name}, got ${value}`);
		}
	}
	const errors = createIssueCollector(issueLimit);
	const warnings = createIssueCollector(issueLimit);

	let fileFailed = false; // file-level error: nothing more is read
	let ended = false;
	let dataRows = 0;
	let header: ResolvedHeader | null = null;
	let headerCount = 0;
	let validator: RowValidator | null = null;
	// One row object, refilled for every record (the hot loop allocates none).
	const checked = emptyCheckedRow();

	const fromName = serialFromFileName(profile, fileName);
	const rows = createRowAssembler({
		batchSize,
		maxBoards: limits.maxBoards,
		skipRows: profile.onBadRow === 'skip-row',
		conflict(row, field, message) {
			(validator as RowValidator).bad(row, (header as ResolvedHeader).indices[field], message);
		},
		tooManyBoards({ row, message }) {
			const iSerial =
				fromName.serial === null ? (header as ResolvedHeader).indices.board_serial : -1;
			const column = iSerial >= 0 ? (header as ResolvedHeader).names[iSerial] : null;
			fail({ row, column, message });
		}
	});

	function fail(issue: IngestIssue): void {
		errors.add(issue);
		fileFailed = true;
		tokens.stop();
	}

	const tokens = createSpiTokenizer(
		{
			delimiter: profile.delimiter === 'auto' ? null : profile.delimiter,
			maxLineBytes: limits.maxLineBytes,
			maxColumns: limits.maxColumns
		},
		{
			header(names) {
				const mapped = mapSpiHeader(names, profile, fromName.serial !== null);
				header = mapped.header;
				headerCount = names.length;
				for (const w of header.warnings) warnings.add(w);
				if (header.errors.length > 0) {
					for (const e of header.errors) errors.add(e);
					fileFailed = true;
					tokens.stop();
					return;
				}
				validator = createRowValidator({
					profile,
					names: header.names,
					columns: mapped.columns,
					serialFromName: fromName.serial,
					parseTime,
					errors,
					issueLimit
				});
			},
			record(cells, row) {
				dataRows++;
				const n = cells.count;
				if (n !== headerCount) {
					errors.add({
						row,
						column: null,
						message:
							n < headerCount
								? `row has ${n} fields, header has ${headerCount} (cut-off line?)`
								: `row has ${n} fields, header has ${headerCount}`
					});
					return rows.reject();
				}
				if ((validator as RowValidator).check(cells, row, checked)) rows.accept(checked);
				else rows.reject();
			},
			badRecord(row, message) {
				dataRows++;
				errors.add({ row, column: null, message });
				rows.reject();
			},
			fileError(row, message) {
				errors.add({ row, column: null, message });
				fileFailed = true;
			}
		}
	);
	if (fromName.error !== null) fail({ row: 0, column: null, message: fromName.error });

	function fileError(message: string): void {
		fail({ row: 0, column: null, message });
	}

	return {
		push(chunk) {
			if (!ended && !fileFailed) tokens.push(chunk);
			return rows.take();
		},
		end() {
			if (ended) return rows.take();
			ended = true;
			if (!fileFailed) tokens.end();
			if (!fileFailed && !tokens.sawRecord) fileError('file is empty');
			else if (!fileFailed && dataRows === 0)
				fileError('no data rows (the file has only a header)');
			else if (!fileFailed && profile.onBadRow === 'skip-row' && rows.rowsAccepted === 0) {
				fileError(`no valid data rows (all ${rows.rowsRejected} rejected)`);
			}
			if (!rows.rejected && !fileFailed) rows.flush();
			return rows.take();
		},
		boards() {
			return rows.boards;
		},
		summary() {
			const failed = fileFailed || rows.rejected;
			let boards: BoardInspection[] = [];
			if (!failed) {
				const aggregates = rows.aggregates();
				boards = rows.boards.map((b, i) => ({ ...b, aggregate: aggregates[i] }));
			}
			return {
				ok: !failed && rows.rowsAccepted > 0,
				fileName,
				delimiter: header === null ? null : tokens.delimiter,
				header: header === null ? [] : (header as ResolvedHeader).names,
				dataRows,
				rowsAccepted: rows.rowsAccepted,
				rowsRejected: rows.rowsRejected,
				errorCount: errors.count,
				errors: errors.list(),
				warningCount: warnings.count,
				warnings: warnings.list(),
				boards
			};
		}
	};
}

/**
 * Drive a parser from an async source of chunks (a Node `ReadStream`, a web `ReadableStream`
 * iterated with `for await`, or an array of strings in tests), yielding each batch as soon as
 * it is complete. Read `parser.summary()` after the loop.
 * @example
 * const parser = createSpiRowParser({ profile, fileName });
 * for await (const batch of parseSpiStream(fs.createReadStream(path), parser)) insert(batch);
 * parser.summary();
 */
export async function* parseSpiStream(
	source: AsyncIterable<Uint8Array | string> | Iterable<Uint8Array | string>,
	parser: SpiRowParser
): AsyncGenerator<SpiRowBatch, void, void> {
	for await (const chunk of source) {
		for (const batch of parser.push(chunk)) yield batch;
	}
	for (const batch of parser.end()) yield batch;
}
