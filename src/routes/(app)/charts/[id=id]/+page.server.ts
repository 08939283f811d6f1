import { fail } from '@sveltejs/kit';
import { hasRole, SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { chartDetail } from '$lib/server/spc/chart-service';
import { listFollowers, setFollowing } from '$lib/server/spc/characteristics';
import { excludePoint, freezeLimits, includePoint } from '$lib/server/spc/limits-lifecycle';
import { refusalToError, refusalToFail } from '$lib/server/refusals';
import { getMinBaselineSubgroups } from '$lib/server/spc/capability-settings';
import type { Actions, PageServerLoad } from './$types';

/** A datetime-local value (taken as UTC) or null; invalid text is an error for that field. */
function dateParam(raw: FormDataEntryValue | string | null): Date | null | 'invalid' {
	const text = String(raw ?? '').trim();
	if (!text) return null;
	const date = new Date(/Z$|[+-]\d\d:\d\d$/.test(text) ? text : `${text}Z`);
	return Number.isNaN(date.getTime()) ? 'invalid' : date;
}

function pointCount(raw: string | null): number {
	const n = Number(raw ?? 200);
	return Number.isInteger(n) && n >= 10 && n <= 5000 ? n : 200;
}

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const actor = requireActor(locals);
	const id = Number(params.id);
	const db = getDb();
	const from = dateParam(url.searchParams.get('from'));
	const to = dateParam(url.searchParams.get('to'));
	const limit = pointCount(url.searchParams.get('n'));
	try {
		// The one chart path (as GET /api/charts/{id}): loaded once, computed once.
		const detail = chartDetail(db, id, {
			limit,
			baselineFrom: from === 'invalid' ? null : from,
			baselineTo: to === 'invalid' ? null : to
		});
		const followers = listFollowers(db, id);
		const point = url.searchParams.get('point');
		return {
			detail,
			limit,
			baseline: { from: url.searchParams.get('from') ?? '', to: url.searchParams.get('to') ?? '' },
			openSignals: detail.openSignals.slice(-50).reverse(),
			following: actor.kind === 'user' && followers.some((f) => f.userId === actor.id),
			followers: followers.map((f) => f.name),
			canEdit: hasRole(actor, SPC_EDITORS),
			minBaseline: getMinBaselineSubgroups(db),
			/** A point to mark (a signal's link): shown only when it is on the chart. */
			highlight: point && detail.chart?.points.some((p) => p.key === point) ? point : null
		};
	} catch (err) {
		refusalToError(err);
	}
};

export const actions = {
	exclude: async ({ locals, params, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		try {
			excludePoint(
				getDb(),
				Number(params.id),
				String(form.get('pointKey') ?? ''),
				String(form.get('reason') ?? ''),
				actor
			);
		} catch (err) {
			return refusalToFail(err, { action: 'exclude' });
		}
		return { action: 'exclude', ok: 'Point excluded from the baseline.' };
	},
	include: async ({ locals, params, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		includePoint(getDb(), Number(params.id), String(form.get('pointKey') ?? ''), actor);
		return { action: 'include', ok: 'Point back in the baseline.' };
	},
	freeze: async ({ locals, params, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		const from = dateParam(form.get('from'));
		const to = dateParam(form.get('to'));
		if (from === 'invalid' || to === 'invalid') {
			return fail(422, {
				action: 'freeze',
				field: from === 'invalid' ? 'from' : 'to',
				error: 'Not a valid date and time.'
			});
		}
		try {
			const v = freezeLimits(
				getDb(),
				Number(params.id),
				{
					baselineFrom: from,
					baselineTo: to,
					note: String(form.get('note') ?? ''),
					limit: pointCount(String(form.get('n') ?? ''))
				},
				actor
			);
			return {
				action: 'freeze',
				ok: `Limits version ${v.version} frozen from ${v.baselinePoints} points.`
			};
		} catch (err) {
			return refusalToFail(err, { action: 'freeze' });
		}
	},
	follow: async ({ locals, params, request }) => {
		const actor = requireActor(locals);
		if (actor.kind !== 'user')
			return fail(400, { action: 'follow', error: 'Only people can follow charts.' });
		const follow = (await request.formData()).get('follow') === '1';
		setFollowing(getDb(), Number(params.id), actor.id, follow);
		return {
			action: 'follow',
			ok: follow ? 'You will get e-mail about new signals.' : 'You no longer follow this chart.'
		};
	}
} satisfies Actions;
