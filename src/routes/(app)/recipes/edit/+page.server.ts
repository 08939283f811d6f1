import { fail, redirect } from '@sveltejs/kit';
import { ENGINEERING } from '$lib/access';
import {
	AMBIENT_PARAMETER_KEYS,
	CATEGORICAL_PARAMETER_KEYS,
	NUMERIC_PARAMETER_KEYS,
	NUMERIC_PARAMETERS
} from '$lib/printlog';
import { readIdealCycleTimeS } from '$lib/printlog/ideal-cycle-time';
import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import { listCurrentRecipes, PrintlogRequestError, saveRecipe } from '$lib/server/printlog';
import { fieldErrorsFromZod, recipeSchema } from '$lib/schemas/printlog';
import type { Actions, PageServerLoad } from './$types';

const WINDOW_KEYS = [...NUMERIC_PARAMETER_KEYS, ...AMBIENT_PARAMETER_KEYS];

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals, ENGINEERING);
	const db = getDb();
	const line = url.searchParams.get('line') ?? '';
	const product = url.searchParams.get('product') ?? '';
	const current = listCurrentRecipes(db).find((r) => r.line === line && r.product === product);
	// A new recipe starts from the catalogue's common-practice windows.
	const defaults = Object.fromEntries(
		WINDOW_KEYS.flatMap((k) => {
			const spec = NUMERIC_PARAMETERS[k];
			const w = spec.defaultWindow;
			// Offered at the field's precision (a pressure window derived from N/mm is 4.5887… kg):
			// min rounded up and max down, so the offer stays inside the common-practice window.
			const f = 10 ** spec.decimals;
			const offered = w && {
				min: Math.ceil(w.min * f - 1e-9) / f,
				target: Math.round(w.target * f) / f,
				max: Math.floor(w.max * f + 1e-9) / f
			};
			return offered && k !== 'ambientTempC' && k !== 'relativeHumidityPct' ? [[k, offered]] : [];
		})
	);
	return {
		lines: listLines(db),
		products: listProducts(db),
		line,
		product,
		current: current ?? null,
		values: (current?.parameters ?? defaults) as Record<string, unknown>
	};
};

/** Read the flat form (`<key>_min`, `<key>_target`, `<key>_max`, categorical `<key>`). */
function parametersFrom(data: FormData): {
	parameters: Record<string, unknown>;
	errors: Record<string, string>;
} {
	const parameters: Record<string, unknown> = {};
	const errors: Record<string, string> = {};
	for (const key of WINDOW_KEYS) {
		const texts = (['min', 'target', 'max'] as const).map((edge) =>
			String(data.get(`${key}_${edge}`) ?? '').trim()
		);
		if (texts.every((t) => t === '')) continue;
		const [min, target, max] = texts.map((t) => (t === '' ? Number.NaN : Number(t)));
		parameters[key] = { min, target, max };
		texts.forEach((t, i) => {
			if (t === '' || !Number.isFinite(Number(t))) {
				errors[`${key}_${['min', 'target', 'max'][i]}`] =
					'give a number (or leave all three blank)';
			}
		});
	}
	for (const key of CATEGORICAL_PARAMETER_KEYS) {
		const value = String(data.get(key) ?? '').trim();
		if (value) parameters[key] = value;
	}
	return { parameters, errors };
}

export const actions = {
	default: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const data = await request.formData();
		const { parameters, errors } = parametersFrom(data);
		const values = Object.fromEntries([...data].map(([k, v]) => [k, String(v)]));
		const cycle = readIdealCycleTimeS(String(data.get('idealCycleTimeS') ?? ''));
		if (!cycle.ok) errors.idealCycleTimeS = cycle.message;
		const input = {
			line: String(data.get('line') ?? ''),
			product: String(data.get('product') ?? ''),
			// Blank: left out, so the current version's value is kept (as POST /api/recipes does).
			...(cycle.ok && cycle.value !== undefined ? { idealCycleTimeS: cycle.value } : {}),
			parameters
		};
		if (Object.keys(errors).length) return fail(400, { errors, values });
		const parsed = recipeSchema.safeParse(input);
		if (!parsed.success) {
			for (const e of fieldErrorsFromZod(parsed.error)) {
				const [, key, edge] = e.field.split('.');
				const name = !key ? e.field : edge ? `${key}_${edge}` : `${key}_min`;
				errors[name] = e.message;
			}
			return fail(400, { errors, values });
		}
		let version: number;
		try {
			version = saveRecipe(
				getDb(),
				{ ...parsed.data, note: String(data.get('note') ?? '') },
				actor
			).version;
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			for (const f of err.fields) errors[f.field] = f.message;
			return fail(err.status, { errors, values });
		}
		const query = new URLSearchParams({
			line: input.line,
			product: input.product,
			saved: String(version)
		});
		redirect(303, `/recipes/history?${query}`);
	}
} satisfies Actions;
