import { fail } from '@sveltejs/kit';
import { ADMIN_ONLY } from '$lib/access';
import { cfxAssignSchema, cfxEndpointSchema } from '$lib/cfx/endpoint-schema';
import { localDayOf } from '$lib/floor/shifts';
import { getDb } from '$lib/server/db';
import { siteShiftSettings } from '$lib/server/floor/shift-settings';
import { requireActor } from '$lib/server/guards';
import {
	CfxInputError,
	assignPendingInspection,
	cfxCounts,
	cfxStatus,
	discardQuarantined,
	listEndpoints,
	listPendingInspections,
	lineMachineEvents,
	listQuarantine,
	printerOee,
	retryQuarantined,
	saveEndpoint
} from '$lib/server/cfx';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, ADMIN_ONLY);
	const db = getDb();
	return {
		status: cfxStatus(),
		totals: cfxCounts(db),
		endpoints: listEndpoints(db),
		quarantine: listQuarantine(db, { limit: 100 }),
		pending: listPendingInspections(db, 100),
		events: lineMachineEvents(db, null, 30),
		// Today's shifts on the site clock; OeeRequestError past the read budget shows as no table.
		shiftSettings: siteShiftSettings(),
		oee: (() => {
			try {
				return printerOee(db, { day: localDayOf(Date.now(), siteShiftSettings().timeZone) });
			} catch {
				return [];
			}
		})(),
		lines: db.$client
			.prepare(`select code, name from lines where active = 1 order by code`)
			.all() as { code: string; name: string }[],
		products: db.$client
			.prepare(`select code, name from products where active = 1 order by code`)
			.all() as { code: string; name: string }[]
	};
};

function idFrom(data: FormData): number | null {
	const id = Number(data.get('id'));
	return Number.isSafeInteger(id) && id > 0 ? id : null;
}

function refused(err: unknown, key: string) {
	if (err instanceof CfxInputError)
		return fail(err.status, { [key]: `${err.field}: ${err.message}` });
	throw err;
}

export const actions = {
	saveEndpoint: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const parsed = cfxEndpointSchema.safeParse({
			handle: data.get('handle') ?? '',
			line: data.get('line') ?? '',
			kind: data.get('kind') ?? ''
		});
		if (!parsed.success) {
			return fail(400, {
				endpointError: parsed.error.issues
					.map((i) => `${i.path.join('.')}: ${i.message}`)
					.join('; ')
			});
		}
		try {
			const { endpoint, created } = saveEndpoint(getDb(), parsed.data, actor);
			return {
				endpointSaved: `${endpoint.handle} → ${endpoint.line} (${endpoint.kind})${created ? '' : ', changed'}`
			};
		} catch (err) {
			return refused(err, 'endpointError');
		}
	},
	retry: async ({ locals, request }) => {
		requireActor(locals, ADMIN_ONLY);
		const id = idFrom(await request.formData());
		if (id === null) return fail(404, { quarantineError: 'No such message.' });
		try {
			const outcome = await retryQuarantined(getDb(), id);
			return {
				quarantineDone:
					outcome.status === 'quarantined'
						? `Message #${id} is still held: ${outcome.reason}`
						: `Message #${id}: ${outcome.status}.`
			};
		} catch (err) {
			return refused(err, 'quarantineError');
		}
	},
	discard: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const id = idFrom(await request.formData());
		if (id === null) return fail(404, { quarantineError: 'No such message.' });
		try {
			discardQuarantined(getDb(), id, actor);
			return { quarantineDone: `Message #${id} discarded.` };
		} catch (err) {
			return refused(err, 'quarantineError');
		}
	},
	assign: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = idFrom(data);
		const parsed = cfxAssignSchema.safeParse({ product: data.get('product') ?? '' });
		if (id === null || !parsed.success)
			return fail(400, { pendingError: 'Choose a product for the unit.' });
		try {
			const out = await assignPendingInspection(getDb(), id, parsed.data.product, actor);
			return {
				pendingDone: `Unit #${id} assigned to ${parsed.data.product}: SPI import #${out.importId} (${out.status}).`
			};
		} catch (err) {
			return refused(err, 'pendingError');
		}
	}
} satisfies Actions;
