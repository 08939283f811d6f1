import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ENGINEERING, hasRole, PRINT_LOGGERS } from '$lib/access';
import { NUMERIC_PARAMETERS, isWindowedParameterKey, type NumericWindow } from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import {
	lastRunOnLine,
	lineByCode,
	listCurrentRecipes,
	listPasteLots,
	listRuns,
	listStencilLife,
	openRuns,
	PrintlogRequestError,
	productByCode,
	productFitRules,
	startRun
} from '$lib/server/printlog';
import { fieldErrorsFromZod, printRunSchema } from '$lib/schemas/printlog';
import {
	runFormErrors,
	runFormSchema,
	runFormToPayload,
	RUN_VALUE_KEYS,
	type RunForm
} from '$lib/schemas/printlog-forms';
import type { Actions, PageServerLoad } from './$types';

/** Initial values: the recipe targets, or the values of the line's last run. */
function prefill(line: string, product: string, from: string): Partial<RunForm> {
	const db = getDb();
	const l = lineByCode(db, line);
	const p = productByCode(db, product);
	if (!l || !p) return { line, product };
	const values: Record<string, unknown> = { line: l.code, product: p.code };
	const last = lastRunOnLine(db, l.id, p.id);
	if (from === 'last' && last) {
		Object.assign(values, last.parameters, {
			ambientTempC: last.ambientTempC ?? undefined,
			relativeHumidityPct: last.relativeHumidityPct ?? undefined,
			bladeCode: last.bladeCode ?? '',
			stencil: last.stencil ?? '',
			pasteLot: last.pasteLot ?? ''
		});
		return values as Partial<RunForm>;
	}
	const recipe = listCurrentRecipes(db).find((r) => r.line === l.code && r.product === p.code);
	for (const [key, expected] of Object.entries(recipe?.parameters ?? {})) {
		if (isWindowedParameterKey(key)) {
			// Ambient conditions are measured, not set: leave them for the technician.
			if (key === 'ambientTempC' || key === 'relativeHumidityPct') continue;
			values[key] = (expected as NumericWindow).target;
		} else values[key] = expected;
	}
	if (last?.bladeCode) values.bladeCode = last.bladeCode;
	return values as Partial<RunForm>;
}

/** The chosen product's approved stencils and allowed pastes (null: no such product). */
function chosenFit(code: string) {
	const db = getDb();
	const p = code ? productByCode(db, code) : undefined;
	return p ? productFitRules(db, p) : null;
}

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireActor(locals, PRINT_LOGGERS);
	const db = getDb();
	const line = url.searchParams.get('line') ?? '';
	const product = url.searchParams.get('product') ?? '';
	const from = url.searchParams.get('from') === 'last' ? 'last' : 'recipe';
	const lots = listPasteLots(db).filter((lot) => lot.state !== 'discarded');
	return {
		lines: listLines(db).filter((l) => l.active),
		products: listProducts(db).filter((p) => p.active),
		chosen: { line, product, from },
		recipes: listCurrentRecipes(db),
		stencils: listStencilLife(db).filter((s) => s.state !== 'retired'),
		lots: lots.map((lot) => ({
			lotNumber: lot.lotNumber,
			alloy: lot.alloy,
			powderType: lot.powderType,
			expiresOn: lot.expiresOn,
			handling: lot.handling,
			leadBearing: lot.leadBearing,
			state: lot.state,
			events: lot.events.map((e) => ({ event: e.event, at: e.at.getTime() }))
		})),
		openRuns: openRuns(db).map((r) => ({
			id: r.id,
			line: r.line,
			product: r.product,
			startedAt: r.startedAt
		})),
		mayOverride: hasRole(actor, ENGINEERING),
		fit: chosenFit(product),
		bladeCodes: [
			...new Set(listRuns(db, { limit: 300 }).flatMap((r) => (r.bladeCode ? [r.bladeCode] : [])))
		],
		units: Object.fromEntries(
			Object.values(NUMERIC_PARAMETERS).map((s) => [s.key, { label: s.label, unit: s.unit }])
		),
		form: await superValidate(prefill(line, product, from), zod4(runFormSchema), { errors: false })
	};
};

export const actions = {
	default: async ({ locals, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const form = await superValidate(request, zod4(runFormSchema));
		if (!form.valid) return fail(400, { form });
		const parsed = printRunSchema.safeParse(runFormToPayload(form.data));
		const problems = parsed.success ? null : runFormErrors(fieldErrorsFromZod(parsed.error));
		let id: number;
		try {
			if (problems || !parsed.success) throw new PrintlogRequestError(422, []);
			id = startRun(getDb(), parsed.data, actor).id;
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			const grouped = problems ?? runFormErrors(err.fields);
			const known = new Set<string>([
				...Object.keys(form.data),
				...RUN_VALUE_KEYS.map((k) => `reason_${k}`)
			]);
			const errors = form.errors as Record<string, string[] | undefined>;
			const other: string[] = [];
			for (const [field, messages] of Object.entries(grouped)) {
				if (known.has(field)) errors[field] = messages;
				else other.push(...messages.map((m) => `${field}: ${m}`));
			}
			errors._errors = [
				err.status === 409 ? err.message : 'The run was not saved: see the marked fields.',
				...other
			];
			return fail(err.status === 409 ? 409 : 422, { form });
		}
		redirect(303, `/print-runs/${id}?started=1`);
	}
} satisfies Actions;
