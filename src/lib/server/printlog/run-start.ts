import type { Actor } from '$lib/access';
import {
	assessLotForRun,
	checkProductFit,
	checkRunAgainstRecipe,
	deviationReasonErrors,
	findOverlappingOpenRun,
	normaliseScannedCode,
	resolveProductFit,
	validateRunTimes,
	type Deviation,
	type FieldError,
	type ProductFitRefusal
} from '$lib/printlog';
import type { PrintRunPayload } from '$lib/schemas/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { publishFloorEvent } from '../floor/events';
import { listStencilRefs, resolveLineProduct, stencilByName } from './lookups';
import { asPasteEvents, getPasteLot, listPasteLots } from './paste-lots';
import { productFitRules } from './product-fit';
import { currentRecipeFor } from './recipes';
import { PrintlogRequestError } from './request-error';
import { getRun, inspectedProductOfSerial, openRuns } from './run-queries';
import { raiseRunSignals } from './run-signals';
import { apiDeviation, auditSnapshot, type ApiDeviation, type StoredDeviation } from './run-view';
import { unknownCode } from './scanned-codes';
import { assessStencil, getStencilLife } from './stencil-life';

/** The result of starting a run. */
export type StartedRun = { id: number; deviations: ApiDeviation[]; warnings: string[] };

/**
 * Start (log) a print run. Checks, all reported together as 422 field errors: unknown line,
 * product, stencil or lot codes; values the recipe sets but the run lacks; deviations without a
 * reason (`deviationReasons.<parameter>`); a discarded lot, or an expired one or one past its
 * time on the stencil (`pasteLot`), and a stencil past its life or quarantined (`stencil`), the
 * last ones unless an engineer or admin gives `overrideReason` (kept on the run, audited);
 * a stencil not approved for the product (`stencil`) or a paste alloy or powder type the product
 * does not allow (`pasteLot`), named in `refusals` too and overridable the same way (the
 * override gets an audit entry of its own, `override-product-fit`);
 * unreadable times. Then, in one transaction: 409 when the line already has an open run, else
 * the run is saved with its recipe version, deviations, reasons and warnings, and audited; its
 * control-chart signals are raised (`raiseRunSignals`).
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

	// Stencil, paste and product belong together (issue 15): refused with the reason, unless an
	// engineer's note overrides it (kept on the run and audited on its own below).
	let fitRefusals: ProductFitRefusal[] = [];
	if (product && stencilRef) {
		const check = checkProductFit(productFitRules(db, product), {
			stencil: stencilRef.name,
			paste: lot && lotByNumber ? lot : null
		});
		const fit = resolveProductFit(check, { mayOverride, note: override });
		errors.push(...fit.errors);
		warnings.push(...fit.warnings);
		fitRefusals = check.refuse;
		overridden ||= fit.overridden;
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
			...(fitRefusals.length && { refusals: fitRefusals }),
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
		if (fitRefusals.length) {
			recordAudit(tx, actor, {
				action: 'override-product-fit',
				entity: 'print_run',
				entityId: row.id,
				after: { note: override, product: product!.code, refusals: fitRefusals }
			});
		}
		return row.id;
	});
	publishFloorEvent({ kind: 'run', what: 'started', runId: id });
	raiseRunSignals(db, id);
	return { id, deviations: deviations.map(apiDeviation), warnings };
}
