import { fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole } from '$lib/access';
import { ApiError } from '$lib/server/api';
import { askConfirmation } from '$lib/server/confirm';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	adoptLearnedLimit,
	learnedLimit,
	learnedLimits,
	DEFAULT_TE_FLOOR
} from '$lib/server/analysis';
import { checkSiteThresholds, saveSiteThresholds, siteThresholds } from '$lib/server/stencils';
import { DEFAULT_THRESHOLDS, STENCIL_TECHNOLOGIES, type StencilTechnology } from '$lib/stencil';
import { TECHNOLOGY_LABELS } from '../labels';
import { adoptQuestion } from './adopt-question';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	const actor = requireActor(locals);
	const db = getDb();
	return {
		thresholds: siteThresholds(db),
		defaults: DEFAULT_THRESHOLDS,
		canEdit: hasRole(actor, ENGINEERING),
		// Streamed: one transfer-efficiency scan per technology (analysis thread), after the form.
		learned: learnedLimits(db, DEFAULT_TE_FLOOR)
	};
};

export const actions = {
	save: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await request.formData();
		// Inputs are named "<technology>.<limit>"; an empty or non-numeric value stays NaN and is refused.
		const values: Record<string, Record<string, number | string>> = {};
		for (const t of STENCIL_TECHNOLOGIES)
			values[t] = Object.fromEntries(
				(['minAreaRatio', 'minAspectRatio'] as const).map((k) => {
					const raw = String(form.get(`${t}.${k}`) ?? '').trim();
					return [k, raw === '' ? raw : Number(raw)];
				})
			);
		const checked = checkSiteThresholds(values);
		if ('errors' in checked) {
			const errors: Record<string, string> = {};
			for (const e of checked.errors) errors[e.field] = e.message;
			return fail(400, { errors, values });
		}
		saveSiteThresholds(getDb(), checked.thresholds, actor);
		return { saved: true };
	},
	/**
	 * Adopt the learned minimum area ratio of one technology (engineers, after a confirmation
	 * naming the change). The limit is computed again on the server, never read from the form.
	 */
	adopt: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await request.formData();
		const technology = String(form.get('technology') ?? '');
		if (!(STENCIL_TECHNOLOGIES as readonly string[]).includes(technology))
			return fail(400, { adoptError: 'Choose a stencil technology to adopt a limit for.' });
		const t = technology as StencilTechnology;
		if (form.get('confirm') !== 'yes') {
			// The question names the change, so the scan runs first (a refusal needs no question).
			const proposal = await learnedLimit(getDb(), t, DEFAULT_TE_FLOOR);
			if (proposal.proposedMinAreaRatio === null)
				return fail(422, {
					adoptError: `No learned limit to adopt for ${TECHNOLOGY_LABELS[t]}: ${proposal.reason ?? 'not enough data'}. Nothing was changed.`
				});
			form.set('expected', String(proposal.proposedMinAreaRatio));
			return askConfirmation(form, '?/adopt', adoptQuestion(proposal))!;
		}
		// The value the engineer saw in the question (from the page or the step without JS).
		const expectedRaw = String(form.get('expected') ?? '');
		const expected = /^\d(\.\d{1,2})?$/.test(expectedRaw) ? Number(expectedRaw) : undefined;
		if (expected === undefined)
			return fail(400, { adoptError: 'The approved limit is missing; open the question again.' });
		try {
			const adopted = await adoptLearnedLimit(
				getDb(),
				{
					technology: t,
					paste: null,
					powder: null,
					fromMs: null,
					toMs: null,
					floor: DEFAULT_TE_FLOOR
				},
				actor,
				{ expectedMinAreaRatio: expected }
			);
			return { adopted: { technology: t, before: adopted.before, after: adopted.after } };
		} catch (err) {
			if (err instanceof ApiError && (err.status === 422 || err.status === 409))
				return fail(err.status, { adoptError: err.message });
			throw err;
		}
	}
} satisfies Actions;
