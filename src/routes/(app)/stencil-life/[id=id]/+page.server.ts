import { error, fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole, PRINT_LOGGERS } from '$lib/access';
import {
	DEFAULT_TENSION,
	solventCleaningCaution,
	STENCIL_STATES,
	stencilTransitionProblem,
	type StencilState
} from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	assessStencil,
	changeStencilState,
	getStencilLife,
	listRuns,
	PrintlogRequestError,
	recordStencilCare,
	recordTension,
	stencilEventLog
} from '$lib/server/printlog';
import {
	parseReadings,
	stencilCareSchema,
	stencilStateSchema,
	tensionFormSchema
} from '$lib/schemas/printlog-forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const life = getStencilLife(db, Number(params.id));
	if (!life) error(404, 'No such stencil.');
	const runs = listRuns(db, { stencilId: life.id, limit: 5000 });
	return {
		life,
		assessment: assessStencil(life),
		nextStates: STENCIL_STATES.filter(
			(s) => !stencilTransitionProblem(life.state as StencilState, s)
		),
		events: stencilEventLog(db, life.id),
		runs: runs.slice(0, 100),
		runTotal: runs.length,
		minTension: DEFAULT_TENSION.minTensionNPerCm,
		solventCaution: solventCleaningCaution(),
		canWrite: hasRole(actor, PRINT_LOGGERS),
		isEngineer: hasRole(actor, ENGINEERING)
	};
};

type Failure = { action: string; errors: Record<string, string> };

function failWith(action: string, err: unknown) {
	if (!(err instanceof PrintlogRequestError)) throw err;
	const errors = Object.fromEntries(err.fields.map((f) => [f.field.split('[')[0], f.message]));
	return fail(err.status, { action, errors } satisfies Failure);
}

function zodFail(action: string, issues: { path: PropertyKey[]; message: string }[]) {
	const errors = Object.fromEntries(issues.map((i) => [String(i.path[0] ?? 'form'), i.message]));
	return fail(400, { action, errors } satisfies Failure);
}

export const actions = {
	state: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const parsed = stencilStateSchema.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return zodFail('state', parsed.error.issues);
		try {
			changeStencilState(getDb(), Number(params.id), parsed.data, actor);
		} catch (err) {
			return failWith('state', err);
		}
		return { action: 'state', message: `State changed to ${parsed.data.toState}.` };
	},
	tension: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const parsed = tensionFormSchema.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return zodFail('tension', parsed.error.issues);
		try {
			const check = recordTension(
				getDb(),
				Number(params.id),
				{ readingsNPerCm: parseReadings(parsed.data.readings), note: parsed.data.note },
				actor
			);
			const low = check.low.map((l) => l.valueNPerCm).join(', ');
			return {
				action: 'tension',
				message: check.pass
					? 'Tension recorded: every reading at or above the minimum.'
					: `Tension recorded. ⚠ Low readings (${low} N/cm): consider quarantining the stencil.`
			};
		} catch (err) {
			return failWith('tension', err);
		}
	},
	care: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const parsed = stencilCareSchema.safeParse(Object.fromEntries(await request.formData()));
		if (!parsed.success) return zodFail('care', parsed.error.issues);
		try {
			recordStencilCare(getDb(), Number(params.id), parsed.data, actor);
		} catch (err) {
			return failWith('care', err);
		}
		return {
			action: 'care',
			message: `${parsed.data.kind === 'cleaning' ? 'Cleaning' : 'Inspection'} logged.`
		};
	}
} satisfies Actions;
