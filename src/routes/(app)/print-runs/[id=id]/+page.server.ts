import { error, fail } from '@sveltejs/kit';
import { and, desc, eq } from 'drizzle-orm';
import { hasRole, PRINT_LOGGERS } from '$lib/access';
import {
	CATEGORICAL_PARAMETER_KEYS,
	describeRunChange,
	NUMERIC_PARAMETER_KEYS,
	runChanges
} from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { auditLog, users } from '$lib/server/db/schema';
import { requireActor } from '$lib/server/guards';
import {
	correctRun,
	endRun,
	getRun,
	PrintlogRequestError,
	listPasteLots,
	listStencilRefs,
	recipeById
} from '$lib/server/printlog';
import { fieldErrorsFromZod } from '$lib/schemas/printlog';
import { correctRunSchema } from '$lib/schemas/printlog-forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const run = getRun(db, Number(params.id));
	if (!run) error(404, 'No such print run.');
	const history = db
		.select({
			at: auditLog.at,
			action: auditLog.action,
			by: users.name,
			actor: auditLog.actor,
			before: auditLog.before,
			after: auditLog.after
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.userId))
		.where(and(eq(auditLog.entity, 'print_run'), eq(auditLog.entityId, String(run.id))))
		.orderBy(desc(auditLog.at))
		.all()
		.map((h) => ({
			at: h.at,
			action: h.action,
			by: h.by ?? h.actor,
			reason: (h.after as { correctionReason?: string } | null)?.correctionReason ?? null,
			// What a correction changed, read from the audit snapshots (older rows too).
			changes:
				h.action === 'correct' && h.before && h.after
					? runChanges(h.before as Record<string, unknown>, h.after as Record<string, unknown>).map(
							describeRunChange
						)
					: []
		}));
	return {
		run,
		recipe: run.recipeId ? (recipeById(db, run.recipeId) ?? null) : null,
		history,
		canWrite: hasRole(actor, PRINT_LOGGERS),
		// Codes offered while correcting (datalists): stencil names and lot numbers.
		stencilNames: [...new Set(listStencilRefs(db).map((s) => s.name))],
		lotNumbers: listPasteLots(db).map((l) => l.lotNumber)
	};
};

/** Read an optional whole number from a form field ('' = not given). */
function wholeNumber(data: FormData, name: string): number | undefined | 'bad' {
	const text = String(data.get(name) ?? '').trim();
	if (text === '') return undefined;
	const n = Number(text);
	return Number.isInteger(n) && n >= 0 && n <= 1_000_000 ? n : 'bad';
}

function optionalNumber(data: FormData, name: string): number | null | undefined | 'bad' {
	if (!data.has(name)) return undefined;
	const text = String(data.get(name) ?? '').trim();
	if (text === '') return null;
	const n = Number(text);
	return Number.isFinite(n) ? n : 'bad';
}

/** The correction form field a payload error belongs to (`parameters.x` → `x`). */
function formField(field: string): string {
	if (field.startsWith('deviationReasons.')) return `reason_${field.slice(17)}`;
	if (field === '(body)') return 'reason';
	return field.replace(/^parameters\./, '').split('.')[0];
}

/**
 * The correction payload a posted form stands for. Text fields: blank blade, board serial or
 * ambient value clears it; blank times, codes and settings keep the recorded value.
 */
function correctionPayload(data: FormData): {
	payload: Record<string, unknown>;
	errors: Record<string, string>;
} {
	const errors: Record<string, string> = {};
	const text = (name: string) => (data.has(name) ? String(data.get(name) ?? '').trim() : undefined);
	const payload: Record<string, unknown> = { reason: text('reason') ?? '' };
	for (const name of ['stencil', 'pasteLot', 'startedAt', 'endedAt'] as const) {
		const value = text(name);
		if (value) payload[name] = value;
	}
	for (const name of ['bladeCode', 'boardSerial'] as const) {
		const value = text(name);
		if (value !== undefined) payload[name] = value === '' ? null : value;
	}
	for (const name of ['ambientTempC', 'relativeHumidityPct'] as const) {
		const value = optionalNumber(data, name);
		if (value === 'bad') errors[name] = 'must be a number';
		else if (value !== undefined) payload[name] = value;
	}
	const boards = wholeNumber(data, 'boardsPrinted');
	if (boards === 'bad') errors.boardsPrinted = 'must be a whole number from 0 to 1000000';
	else if (boards !== undefined) payload.boardsPrinted = boards;
	const parameters: Record<string, unknown> = {};
	for (const key of NUMERIC_PARAMETER_KEYS) {
		const value = optionalNumber(data, key);
		if (value === 'bad') errors[key] = 'must be a number';
		else if (value !== undefined && value !== null) parameters[key] = value;
	}
	for (const key of CATEGORICAL_PARAMETER_KEYS) {
		const value = text(key);
		if (value) parameters[key] = value;
	}
	payload.parameters = parameters;
	const reasons: Record<string, string> = {};
	for (const [name, value] of data) {
		if (name.startsWith('reason_') && String(value).trim()) reasons[name.slice(7)] = String(value);
	}
	if (Object.keys(reasons).length) payload.deviationReasons = reasons;
	return { payload, errors };
}

export const actions = {
	end: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const data = await request.formData();
		const boardsPrinted = wholeNumber(data, 'boardsPrinted');
		if (boardsPrinted === 'bad') {
			return fail(400, {
				end: { errors: { boardsPrinted: 'must be a whole number from 0 to 1000000' } }
			});
		}
		try {
			endRun(getDb(), Number(params.id), { boardsPrinted }, actor);
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			return fail(err.status, { end: { errors: { boardsPrinted: err.message } } });
		}
		return { end: { message: 'Run ended.' } };
	},
	correct: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const data = await request.formData();
		const db = getDb();
		const id = Number(params.id);
		const run = getRun(db, id);
		if (!run) error(404, 'No such print run.');
		const { payload, errors } = correctionPayload(data);
		const parsed = correctRunSchema.safeParse(payload);
		if (!parsed.success) {
			for (const f of fieldErrorsFromZod(parsed.error)) errors[formField(f.field)] ??= f.message;
		}
		if (Object.keys(errors).length || !parsed.success) return fail(400, { correct: { errors } });
		try {
			correctRun(db, id, parsed.data, actor);
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			for (const f of err.fields) errors[formField(f.field)] ??= f.message;
			return fail(err.status, { correct: { errors } });
		}
		return { correct: { message: 'Correction saved; the audit log keeps the previous values.' } };
	}
} satisfies Actions;
