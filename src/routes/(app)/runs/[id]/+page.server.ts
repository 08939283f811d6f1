import { error, fail } from '@sveltejs/kit';
import { and, desc, eq } from 'drizzle-orm';
import { hasRole, PRINT_LOGGERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { auditLog, users } from '$lib/server/db/schema';
import { requireActor } from '$lib/server/guards';
import {
	correctRun,
	endRun,
	evaluateChartsForRun,
	getRun,
	PrintlogRequestError,
	recipeById
} from '$lib/server/printlog';
import type { Actions, PageServerLoad } from './$types';

function runId(param: string): number {
	const id = Number(param);
	if (!Number.isSafeInteger(id) || id <= 0) error(404, 'No such print run.');
	return id;
}

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const run = getRun(db, runId(params.id));
	if (!run) error(404, 'No such print run.');
	const history = db
		.select({ at: auditLog.at, action: auditLog.action, by: users.name, actor: auditLog.actor, after: auditLog.after })
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.userId))
		.where(and(eq(auditLog.entity, 'print_run'), eq(auditLog.entityId, String(run.id))))
		.orderBy(desc(auditLog.at))
		.all()
		.map((h) => ({
			at: h.at,
			action: h.action,
			by: h.by ?? h.actor,
			reason: (h.after as { correctionReason?: string } | null)?.correctionReason ?? null
		}));
	return {
		run,
		recipe: run.recipeId ? (recipeById(db, run.recipeId) ?? null) : null,
		history,
		canWrite: hasRole(actor, PRINT_LOGGERS)
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

export const actions = {
	end: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const data = await request.formData();
		const boardsPrinted = wholeNumber(data, 'boardsPrinted');
		if (boardsPrinted === 'bad') {
			return fail(400, { end: { errors: { boardsPrinted: 'must be a whole number from 0 to 1000000' } } });
		}
		try {
			endRun(getDb(), runId(params.id), { boardsPrinted }, actor);
			await evaluateChartsForRun(getDb(), runId(params.id));
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
		const id = runId(params.id);
		const run = getRun(db, id);
		if (!run) error(404, 'No such print run.');
		const errors: Record<string, string> = {};
		const parameters: Record<string, number> = {};
		for (const key of Object.keys(run.parameters)) {
			if (typeof run.parameters[key] !== 'number') continue;
			const value = optionalNumber(data, key);
			if (value === 'bad' || value === null) errors[key] = 'must be a number';
			else if (value !== undefined) parameters[key] = value;
		}
		const boards = wholeNumber(data, 'boardsPrinted');
		if (boards === 'bad') errors.boardsPrinted = 'must be a whole number from 0 to 1000000';
		const boardsPrinted = boards === 'bad' ? undefined : boards;
		const reasons: Record<string, string> = {};
		for (const [name, value] of data) {
			if (name.startsWith('reason_') && String(value).trim()) reasons[name.slice(7)] = String(value);
		}
		if (Object.keys(errors).length) return fail(400, { correct: { errors } });
		try {
			correctRun(
				db,
				id,
				{
					reason: String(data.get('reason') ?? ''),
					parameters,
					...(boardsPrinted !== undefined && { boardsPrinted }),
					deviationReasons: reasons
				},
				actor
			);
			await evaluateChartsForRun(db, id);
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			for (const f of err.fields) {
				const name = f.field.startsWith('deviationReasons.')
					? `reason_${f.field.slice(17)}`
					: f.field.replace(/^parameters\./, '');
				errors[name] = f.message;
			}
			return fail(err.status, { correct: { errors } });
		}
		return { correct: { message: 'Correction saved; the audit log keeps the previous values.' } };
	}
} satisfies Actions;
