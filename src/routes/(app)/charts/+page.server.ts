import { hasRole, SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	getCapabilityThresholds,
	getMinBaselineSubgroups,
	setCapabilityThresholds,
	setMinBaselineSubgroups
} from '$lib/server/spc/capability-settings';
import { refusalToFail } from '$lib/server/refusals';
import { chartSummary } from '$lib/server/spc/summary';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	const db = getDb();
	return {
		charts: chartSummary(db),
		thresholds: getCapabilityThresholds(db),
		minBaseline: getMinBaselineSubgroups(db),
		canEdit: hasRole(actor, SPC_EDITORS)
	};
};

/** A decimal typed in a form field: digits with an optional point, nothing else. */
function decimal(raw: FormDataEntryValue | null): number {
	const text = String(raw ?? '').trim();
	return /^\d+(\.\d+)?$/.test(text) ? Number(text) : NaN;
}

export const actions = {
	thresholds: async ({ locals, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		const input = {
			capable: decimal(form.get('capable')),
			marginal: decimal(form.get('marginal')),
			confidenceLevel: decimal(form.get('confidencePct')) / 100
		};
		try {
			setCapabilityThresholds(getDb(), input, actor);
			setMinBaselineSubgroups(getDb(), decimal(form.get('minBaseline')), actor);
		} catch (err) {
			return refusalToFail(err, { action: 'thresholds' });
		}
		return { action: 'thresholds', ok: 'Thresholds saved: every chart is judged with them now.' };
	}
} satisfies Actions;
