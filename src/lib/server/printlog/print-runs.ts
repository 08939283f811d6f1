import { and, asc, desc, eq, gte, inArray, isNull, lte, type SQL } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import {
	assessLotForRun,
	checkRunAgainstRecipe,
	deviationReasonErrors,
	findOverlappingOpenRun,
	matchScannedCode,
	normaliseScannedCode,
	parseBoardSerial,
	runChanges,
	validateRunTimes,
	type Deviation,
	type FieldError,
	type RecipeParameters
} from '$lib/printlog';
import type { PrintRunPayload } from '$lib/schemas/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { lines, pasteLots, printRuns, products, spiBoards, stencils, users } from '../db/schema';
import { listStencilRefs, resolveLineProduct, stencilByName } from './lookups';
import { asPasteEvents, getPasteLot, listPasteLots } from './paste-lots';
import { currentRecipeFor, recipeById } from './recipes';
import { PrintlogRequestError } from './request-error';
import { assessStencil, getStencilLife } from './stencil-life';
import { publishFloorEvent } from '../floor/events';
import { writeCsv, type CsvCell } from '$lib/csv/write-csv';

/** A deviation as stored with a run: the pure check's result plus the technician's reason. */
export type StoredDeviation = Deviation & { reason: string | null };

/** A deviation as the API answers it: `{ parameter, value, min, max }` (+ `expected` for text). */
export type ApiDeviation = {
	parameter: string;
	value: number | string;
	min: number | null;
	max: number | null;
	expected?: string;
};

/** A print run as pages and the API show it. */
export type RunView = {
	id: number;
	line: string;
	product: string;
	stencil: string | null;
	stencilRevision: string | null;
	stencilId: number | null;
	pasteLot: string | null;
	pasteLotId: number | null;
	bladeCode: string | null;
	/** Serial of the first board printed, as scanned (null when not logged). */
	boardSerial: string | null;
	recipeVersion: number | null;
	recipeId: number | null;
	parameters: Record<string, unknown>;
	ambientTempC: number | null;
	relativeHumidityPct: number | null;
	operator: string | null;
	startedAt: Date;
	endedAt: Date | null;
	boardsPrinted: number;
	deviations: StoredDeviation[];
	warnings: string[];
	overrideReason: string | null;
	corrections: number;
};

/** Filters of the run list and `GET /api/print-runs`. Codes as scanned; dates inclusive. */
export type RunFilters = {
	line?: string;
	product?: string;
	stencil?: string;
	lot?: string;
	from?: Date;
	to?: Date;
	open?: boolean;
	/** One stencil revision by id (the stencil life page). */
	stencilId?: number;
	limit?: number;
};

function runQuery(db: Db) {
	return db
		.select({
			run: printRuns,
			line: lines.code,
			product: products.code,
			stencil: stencils.name,
			stencilRevision: stencils.revision,
			pasteLot: pasteLots.lotNumber,
			operator: users.name
		})
		.from(printRuns)
		.innerJoin(lines, eq(lines.id, printRuns.lineId))
		.innerJoin(products, eq(products.id, printRuns.productId))
		.leftJoin(stencils, eq(stencils.id, printRuns.stencilId))
		.leftJoin(pasteLots, eq(pasteLots.id, printRuns.pasteLotId))
		.leftJoin(users, eq(users.id, printRuns.operatorUserId));
}

type RunRow = Awaited<ReturnType<ReturnType<typeof runQuery>['all']>>[number];

function toView(row: RunRow): RunView {
	const r = row.run;
	return {
		id: r.id,
		line: row.line,
		product: row.product,
		stencil: row.stencil,
		stencilRevision: row.stencilRevision,
		stencilId: r.stencilId,
		pasteLot: row.pasteLot,
		pasteLotId: r.pasteLotId,
		bladeCode: r.bladeCode,
		boardSerial: r.boardSerial,
		recipeVersion: r.recipeVersion,
		recipeId: r.recipeId,
		parameters: r.parameters,
		ambientTempC: r.ambientTempC,
		relativeHumidityPct: r.relativeHumidityPct,
		operator: row.operator,
		startedAt: r.startedAt,
		endedAt: r.endedAt,
		boardsPrinted: r.boardsPrinted,
		deviations: r.deviations as StoredDeviation[],
		warnings: r.warnings,
		overrideReason: r.overrideReason,
		corrections: r.corrections
	};
}

/** The API shape of a deviation. */
export function apiDeviation(d: Deviation): ApiDeviation {
	if (d.kind === 'numeric')
		return { parameter: d.parameter, value: d.value, min: d.min, max: d.max };
	return { parameter: d.parameter, value: d.value, min: null, max: null, expected: d.expected };
}

/** Runs matching the filters, newest first (at most `limit`, default 500). */
export function listRuns(db: Db, filters: RunFilters = {}): RunView[] {
	const where: SQL[] = [];
	const { line, product } = resolveLineProduct(db, {
		line: filters.line ?? '',
		product: filters.product ?? ''
	});
	// An unknown code filters everything out rather than being ignored.
	if (filters.line) where.push(eq(printRuns.lineId, line?.id ?? -1));
	if (filters.product) where.push(eq(printRuns.productId, product?.id ?? -1));
	if (filters.stencil) {
		const ids = listStencilRefs(db)
			.filter((s) => matchScannedCode(filters.stencil!, [{ code: s.name, label: '' }]).match)
			.map((s) => s.id);
		where.push(inArray(printRuns.stencilId, ids.length ? ids : [-1]));
	}
	if (filters.lot) {
		const lot = getPasteLot(db, filters.lot);
		where.push(eq(printRuns.pasteLotId, lot?.id ?? -1));
	}
	if (filters.from) where.push(gte(printRuns.startedAt, filters.from));
	if (filters.to) where.push(lte(printRuns.startedAt, filters.to));
	if (filters.open) where.push(isNull(printRuns.endedAt));
	if (filters.stencilId !== undefined) where.push(eq(printRuns.stencilId, filters.stencilId));
	return runQuery(db)
		.where(and(...where))
		.orderBy(desc(printRuns.startedAt), desc(printRuns.id))
		.limit(Math.min(filters.limit ?? 500, 5000))
		.all()
		.map(toView);
}

/** One run by id. */
export function getRun(db: Db, id: number): RunView | undefined {
	const row = runQuery(db).where(eq(printRuns.id, id)).get();
	return row && toView(row);
}

/** The newest run on a line (any product), to pre-fill the next one. */
export function lastRunOnLine(db: Db, lineId: number, productId?: number): RunView | undefined {
	const where = [eq(printRuns.lineId, lineId)];
	if (productId !== undefined) where.push(eq(printRuns.productId, productId));
	const row = runQuery(db)
		.where(and(...where))
		.orderBy(desc(printRuns.startedAt), desc(printRuns.id))
		.get();
	return row && toView(row);
}

/** Open runs (one per line at most), by line code. */
export function openRuns(db: Db): RunView[] {
	return runQuery(db).where(isNull(printRuns.endedAt)).orderBy(asc(lines.code)).all().map(toView);
}

/** "did you mean …" for an unknown scanned code. */
function unknownCode(what: string, code: string, candidates: string[]): string {
	const near = matchScannedCode(
		code,
		candidates.map((c) => ({ code: c, label: c }))
	).suggestions.map((s) => s.code);
	const hint = near.length ? `; did you mean ${near.join(', ')}?` : '';
	return `no ${what} "${code}" is known${hint}`;
}

/**
 * The product an SPI inspection file named for this exact board serial (newest inspection), or
 * undefined when SPI has not seen the board. One lookup on the serial index.
 */
export function inspectedProductOfSerial(
	db: Db,
	serial: string
): { productCode: string; inspectedAt: Date } | undefined {
	return db
		.select({ productCode: spiBoards.productCode, inspectedAt: spiBoards.inspectedAt })
		.from(spiBoards)
		.where(eq(spiBoards.serial, serial))
		.orderBy(desc(spiBoards.inspectedAt))
		.limit(1)
		.get();
}

/** The result of starting a run. */
export type StartedRun = { id: number; deviations: ApiDeviation[]; warnings: string[] };

/**
 * Start (log) a print run. Checks, all reported together as 422 field errors: unknown line,
 * product, stencil or lot codes; values the recipe sets but the run lacks; deviations without a
 * reason (`deviationReasons.<parameter>`); a discarded lot, or an expired one or one past its
 * time on the stencil (`pasteLot`), and a stencil past its life or quarantined (`stencil`), the
 * last ones unless an engineer or admin gives `overrideReason` (kept on the run, audited);
 * unreadable times. Then, in one transaction: 409 when the line already has an open run, else
 * the run is saved with its recipe version, deviations, reasons and warnings, and audited.
 * @throws PrintlogRequestError 422 / 409 as above.
 */
export function startRun(
	db: Db,
	input: PrintRunPayload,
	actor: Actor,
	nowMs = Date.now()
): StartedRun {
	const errors: FieldError[] = [];
	const warnings: string[] = [];
	const { line, product, errors: codeErrors } = resolveLineProduct(db, input);
	errors.push(...codeErrors);
	const stencilRef = stencilByName(db, input.stencil);
	if (!stencilRef) {
		const names = [...new Set(listStencilRefs(db).map((s) => s.name))];
		errors.push({ field: 'stencil', message: unknownCode('stencil', input.stencil, names) });
	}
	const lot = getPasteLot(db, input.pasteLot, nowMs);
	const lotByNumber = lot && lot.lotNumber.toUpperCase() === input.pasteLot.trim().toUpperCase();
	if (!lot || !lotByNumber) {
		const numbers = listPasteLots(db, nowMs).map((l) => l.lotNumber);
		errors.push({ field: 'pasteLot', message: unknownCode('paste lot', input.pasteLot, numbers) });
	}
	const startedAtMs = input.startedAt ? Date.parse(input.startedAt) : nowMs;
	errors.push(...validateRunTimes({ startedAt: startedAtMs }));

	const recipe = line && product ? currentRecipeFor(db, line.id, product.id) : undefined;
	const actual = {
		...input.parameters,
		...(input.ambientTempC !== undefined && { ambientTempC: input.ambientTempC }),
		...(input.relativeHumidityPct !== undefined && {
			relativeHumidityPct: input.relativeHumidityPct
		})
	};
	let deviations: Deviation[] = [];
	if (line && product) {
		if (!recipe) {
			warnings.push(`no recipe for ${product.code} on ${line.code}: the values were not checked`);
		}
		const check = checkRunAgainstRecipe(actual, {
			line: line.code,
			product: product.code,
			parameters: recipe?.parameters ?? {}
		});
		errors.push(...check.errors);
		deviations = check.deviations;
		errors.push(...deviationReasonErrors(deviations, input.deviationReasons));
	}

	if (input.boardSerial && product) {
		// A board SPI already inspected as another product points at a wrong product or label.
		const seen = inspectedProductOfSerial(db, input.boardSerial);
		if (seen && normaliseScannedCode(seen.productCode) !== normaliseScannedCode(product.code)) {
			warnings.push(
				`board ${input.boardSerial} was inspected as product ${seen.productCode} ` +
					`(SPI, ${seen.inspectedAt.toISOString()}), not ${product.code}: check the product and the label`
			);
		}
	}

	const override = input.overrideReason?.trim() || null;
	const mayOverride = actor.role === 'engineer' || actor.role === 'admin';
	let overridden = false;
	if (override && !mayOverride) {
		errors.push({
			field: 'overrideReason',
			message: 'only an engineer or admin may override a refusal'
		});
	}
	if (lot && lotByNumber) {
		const assessment = assessLotForRun(lot, asPasteEvents(lot.events), lot.handling, startedAtMs);
		// Expired or over its time on the stencil: an engineer may go on with a note (kept on the
		// run, audited); discarded or unreadable lots are never used.
		const overridable = assessment.refuse.every((r) => r.canOverride);
		for (const r of assessment.refuse) {
			if (overridable && mayOverride && override) {
				warnings.push(`${r.message}; used on the engineer's override: ${override}`);
				overridden = true;
			} else {
				const how = r.canOverride
					? mayOverride
						? ' (give an override reason to use it anyway)'
						: ' (an engineer can override with a reason)'
					: '';
				errors.push({ field: 'pasteLot', message: r.message + how });
			}
		}
		warnings.push(...assessment.warn.map((w) => w.message));
	}
	if (stencilRef) {
		const life = getStencilLife(db, stencilRef.id)!;
		const assessment = assessStencil(life, mayOverride ? override : null);
		if (assessment.refuse) {
			const how = assessment.canOverride
				? mayOverride
					? ' (give an override reason to use it anyway)'
					: ' (an engineer can override with a reason)'
				: '';
			errors.push({ field: 'stencil', message: assessment.refuse.message + how });
		}
		if (assessment.warn) warnings.push(assessment.warn.message);
		overridden ||= assessment.overridden;
	}

	if (errors.length > 0) {
		const missing = errors
			.filter((e) => e.field.startsWith('deviationReasons.'))
			.map((e) => e.field.slice('deviationReasons.'.length));
		const summary = missing.length
			? `A reason is required for each deviation: ${missing.join(', ')}.`
			: 'The run was not saved: ' + errors.map((e) => `${e.field}: ${e.message}`).join('; ');
		throw new PrintlogRequestError(422, errors, summary, {
			...(missing.length && { parameters: missing }),
			deviations: deviations.map(apiDeviation)
		});
	}

	const reasons = input.deviationReasons ?? {};
	const stored: StoredDeviation[] = deviations.map((d) => ({
		...d,
		reason: reasons[d.parameter as keyof typeof reasons]?.trim() || null
	}));
	const id = db.transaction((tx) => {
		const open = openRuns(tx as unknown as Db).map((r) => ({ ...r, line: r.line }));
		const clash = findOverlappingOpenRun(open, line!.code);
		if (clash) throw new PrintlogRequestError(409, [{ field: 'line', message: clash.message }]);
		const row = tx
			.insert(printRuns)
			.values({
				lineId: line!.id,
				productId: product!.id,
				stencilId: stencilRef!.id,
				pasteLotId: lot!.id,
				bladeCode: input.bladeCode ?? null,
				boardSerial: input.boardSerial ?? null,
				recipeId: recipe?.id ?? null,
				recipeVersion: recipe?.version ?? null,
				parameters: input.parameters as Record<string, unknown>,
				ambientTempC: input.ambientTempC ?? null,
				relativeHumidityPct: input.relativeHumidityPct ?? null,
				operatorUserId: actor.kind === 'user' ? actor.id : null,
				startedAt: new Date(startedAtMs),
				boardsPrinted: input.boardsPrinted ?? 0,
				deviations: stored,
				deviationReasons: Object.fromEntries(
					Object.entries(reasons).filter(([, v]) => v && v.trim())
				) as Record<string, string>,
				warnings,
				overrideReason: overridden ? override : null,
				overrideByUserId: overridden && actor.kind === 'user' ? actor.id : null
			})
			.returning({ id: printRuns.id })
			.get();
		recordAudit(tx, actor, {
			action: 'start',
			entity: 'print_run',
			entityId: row.id,
			after: auditSnapshot(getRun(tx as unknown as Db, row.id)!)
		});
		return row.id;
	});
	publishFloorEvent({ kind: 'run', what: 'started', runId: id });
	return { id, deviations: deviations.map(apiDeviation), warnings };
}

function auditSnapshot(run: RunView): Record<string, unknown> {
	return {
		...run,
		startedAt: run.startedAt.toISOString(),
		endedAt: run.endedAt?.toISOString() ?? null
	};
}

function requireRun(db: Db, id: number): RunView {
	const run = getRun(db, id);
	if (!run) throw new PrintlogRequestError(404, [{ field: 'id', message: `no print run #${id}` }]);
	return run;
}

/**
 * End an open run at `endedAt` (default now) with the boards printed.
 * @throws PrintlogRequestError 404 unknown run; 409 already ended; 422 end before start.
 */
export function endRun(
	db: Db,
	id: number,
	input: { endedAt?: string; boardsPrinted?: number },
	actor: Actor,
	nowMs = Date.now()
): RunView {
	return db.transaction((tx) => {
		const run = requireRun(tx as unknown as Db, id);
		if (run.endedAt) {
			throw new PrintlogRequestError(409, [
				{ field: 'endedAt', message: `run ${id} already ended at ${run.endedAt.toISOString()}` }
			]);
		}
		const endedAtMs = input.endedAt ? Date.parse(input.endedAt) : nowMs;
		const errors = validateRunTimes({ startedAt: run.startedAt, endedAt: endedAtMs });
		if (errors.length) throw new PrintlogRequestError(422, errors);
		tx.update(printRuns)
			.set({
				endedAt: new Date(endedAtMs),
				...(input.boardsPrinted !== undefined && { boardsPrinted: input.boardsPrinted })
			})
			.where(eq(printRuns.id, id))
			.run();
		const after = requireRun(tx as unknown as Db, id);
		recordAudit(tx, actor, {
			action: 'end',
			entity: 'print_run',
			entityId: id,
			before: { endedAt: null, boardsPrinted: run.boardsPrinted },
			after: { endedAt: after.endedAt!.toISOString(), boardsPrinted: after.boardsPrinted }
		});
		// Listeners run after this synchronous transaction has committed.
		publishFloorEvent({ kind: 'run', what: 'ended', runId: id });
		return after;
	});
}

/** What a correction may change; `reason` is required and kept in the audit log. */
export type RunCorrection = {
	reason: string;
	/** Stencil name and lot number as scanned (codes, like a new run). */
	stencil?: string;
	pasteLot?: string;
	boardSerial?: string | null;
	parameters?: Record<string, unknown>;
	ambientTempC?: number | null;
	relativeHumidityPct?: number | null;
	boardsPrinted?: number;
	startedAt?: string;
	endedAt?: string | null;
	bladeCode?: string | null;
	deviationReasons?: Record<string, string | undefined>;
};

/**
 * Correct a logged run. Every recorded field may change: stencil and paste lot (by the code a
 * scanner reads; unknown codes refused with suggestions, a newly named lot refused when it was
 * expired or discarded at the run's start), blade, board serial, start and end, board count,
 * ambient values and every setting. The new values are checked again against the recipe version
 * the run recorded (deviations need reasons as at start), times must stay in order and the line
 * must not get two open runs. The audit log keeps the before and after with the reason; the
 * run's correction counter goes up, so a corrected run is never silently different. A
 * correction that changes nothing is refused.
 * @throws PrintlogRequestError 404 / 422 / 409.
 */
export function correctRun(db: Db, id: number, input: RunCorrection, actor: Actor): RunView {
	return db.transaction((tx) => {
		const t = tx as unknown as Db;
		const run = requireRun(t, id);
		const errors: FieldError[] = [];
		if (!input.reason?.trim()) {
			errors.push({ field: 'reason', message: 'say why the run is corrected' });
		}
		const parameters = { ...run.parameters, ...(input.parameters ?? {}) };
		const ambientTempC = input.ambientTempC !== undefined ? input.ambientTempC : run.ambientTempC;
		const relativeHumidityPct =
			input.relativeHumidityPct !== undefined ? input.relativeHumidityPct : run.relativeHumidityPct;
		const startedAt = input.startedAt ?? run.startedAt.toISOString();
		const endedAt =
			input.endedAt !== undefined ? input.endedAt : (run.endedAt?.toISOString() ?? null);
		errors.push(...validateRunTimes({ startedAt, endedAt }));

		let stencilId = run.stencilId;
		const stencilName = input.stencil?.trim();
		if (
			stencilName &&
			normaliseScannedCode(stencilName) !== normaliseScannedCode(run.stencil ?? '')
		) {
			const ref = stencilByName(t, stencilName);
			if (ref) stencilId = ref.id;
			else {
				const names = [...new Set(listStencilRefs(t).map((s) => s.name))];
				errors.push({ field: 'stencil', message: unknownCode('stencil', stencilName, names) });
			}
		}
		let pasteLotId = run.pasteLotId;
		const lotNumber = input.pasteLot?.trim();
		if (lotNumber && normaliseScannedCode(lotNumber) !== normaliseScannedCode(run.pasteLot ?? '')) {
			const startMs = Date.parse(startedAt);
			const lot = getPasteLot(t, lotNumber);
			if (!lot || normaliseScannedCode(lot.lotNumber) !== normaliseScannedCode(lotNumber)) {
				const numbers = listPasteLots(t).map((l) => l.lotNumber);
				errors.push({ field: 'pasteLot', message: unknownCode('paste lot', lotNumber, numbers) });
			} else {
				pasteLotId = lot.id;
				if (Number.isFinite(startMs)) {
					const events = asPasteEvents(lot.events);
					const refused = assessLotForRun(lot, events, lot.handling, startMs).refuse;
					for (const r of refused) {
						errors.push({ field: 'pasteLot', message: `${r.message} (at the run's start)` });
					}
				}
			}
		}
		let boardSerial = run.boardSerial;
		if (input.boardSerial !== undefined) {
			const parsed = parseBoardSerial(input.boardSerial);
			if (parsed.error) errors.push(parsed.error);
			boardSerial = parsed.value;
		}

		const recipe = run.recipeId ? recipeById(t, run.recipeId) : undefined;
		const check = checkRunAgainstRecipe(
			{
				...parameters,
				...(ambientTempC !== null && { ambientTempC }),
				...(relativeHumidityPct !== null && { relativeHumidityPct })
			},
			{
				line: run.line,
				product: run.product,
				parameters: (recipe?.parameters ?? {}) as RecipeParameters
			}
		);
		errors.push(...check.errors);
		const reasons: Record<string, string | undefined> = {
			...Object.fromEntries(
				run.deviations.filter((d) => d.reason).map((d) => [d.parameter, d.reason!])
			),
			...(input.deviationReasons ?? {})
		};
		errors.push(...deviationReasonErrors(check.deviations, reasons));
		if (errors.length) throw new PrintlogRequestError(422, errors);
		if (endedAt === null && run.endedAt !== null) {
			const clash = findOverlappingOpenRun(openRuns(t), run.line, id);
			if (clash) {
				throw new PrintlogRequestError(409, [{ field: 'endedAt', message: clash.message }]);
			}
		}
		const stored: StoredDeviation[] = check.deviations.map((d) => ({
			...d,
			reason: reasons[d.parameter]?.trim() || null
		}));
		tx.update(printRuns)
			.set({
				stencilId,
				pasteLotId,
				boardSerial,
				parameters,
				ambientTempC,
				relativeHumidityPct,
				startedAt: new Date(Date.parse(startedAt)),
				endedAt: endedAt === null ? null : new Date(Date.parse(endedAt)),
				boardsPrinted: input.boardsPrinted ?? run.boardsPrinted,
				bladeCode: input.bladeCode !== undefined ? input.bladeCode?.trim() || null : run.bladeCode,
				deviations: stored,
				deviationReasons: Object.fromEntries(
					stored.filter((d) => d.reason).map((d) => [d.parameter, d.reason!])
				),
				corrections: run.corrections + 1
			})
			.where(eq(printRuns.id, id))
			.run();
		const after = requireRun(t, id);
		const before = auditSnapshot(run);
		const afterSnapshot = auditSnapshot(after);
		const reasonsChanged =
			JSON.stringify(run.deviations.map((d) => d.reason)) !==
			JSON.stringify(after.deviations.map((d) => d.reason));
		if (runChanges(before, afterSnapshot).length === 0 && !reasonsChanged) {
			// Throwing rolls the update back: a correction must change something.
			throw new PrintlogRequestError(422, [
				{ field: '(body)', message: 'nothing differs from the recorded run: nothing to correct' }
			]);
		}
		recordAudit(tx, actor, {
			action: 'correct',
			entity: 'print_run',
			entityId: id,
			before,
			after: { ...afterSnapshot, correctionReason: input.reason.trim() }
		});
		// Listeners run after this synchronous transaction has committed.
		publishFloorEvent({ kind: 'run', what: 'corrected', runId: id });
		return after;
	});
}

/** Columns of the run CSV export, in order. */
export const RUN_CSV_COLUMNS = [
	'id',
	'line',
	'product',
	'recipeVersion',
	'stencil',
	'stencilRevision',
	'pasteLot',
	'bladeCode',
	'boardSerial',
	'operator',
	'startedAt',
	'endedAt',
	'boardsPrinted',
	'ambientTempC',
	'relativeHumidityPct'
] as const;

/**
 * Runs as CSV through the one writer ($lib/csv/write-csv: RFC 4180, CRLF, formula-like text
 * escaped), one column per parameter, deviations and their reasons in the last columns. Numbers
 * unrounded; times ISO 8601 UTC.
 */
export function runsToCsv(runs: readonly RunView[], parameterKeys: readonly string[]): string {
	const header = [...RUN_CSV_COLUMNS, ...parameterKeys, 'deviations', 'warnings', 'corrections'];
	const rows: CsvCell[][] = runs.map((run) => [
		...RUN_CSV_COLUMNS.map((c) => run[c] as CsvCell),
		...parameterKeys.map((k) => run.parameters[k] as CsvCell),
		run.deviations
			.map((d) => `${d.parameter}=${d.value}${d.reason ? ` (${d.reason})` : ''}`)
			.join('; '),
		run.warnings.join('; '),
		run.corrections as CsvCell
	]);
	return writeCsv([header, ...rows]);
}
