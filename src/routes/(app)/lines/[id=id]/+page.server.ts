import { error, fail } from '@sveltejs/kit';
import {
	hasRole,
	LINE_ACKNOWLEDGERS,
	SIGNAL_ASSIGNERS,
	SPC_EDITORS,
	PRINT_LOGGERS
} from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { lineMachineEvents } from '$lib/server/cfx';
import { openSignalsByLine } from '$lib/server/floor/facts';
import { assignableUsers, assignSignal, AssignError } from '$lib/server/floor/signal-owners';
import { getCauseLists } from '$lib/server/spc/cause-lists';
import { acknowledgeFromForm } from '$lib/server/spc/acknowledge';
import type { Actions, PageServerLoad } from './$types';

/** Machine events listed on the line view (the newest; `GET /api/cfx/events` gives more). */
const MACHINE_EVENTS_SHOWN = 15;

/** The technician's line view: the line, its last boards and open signals (the tile comes live). */
export const load: PageServerLoad = ({ locals, params, depends }) => {
	const actor = requireActor(locals);
	depends('floor:line');
	const db = getDb();
	const id = Number(params.id);
	const line = db.$client.prepare(`select id, code, name from lines where id = ?`).get(id) as
		{ id: number; code: string; name: string } | undefined;
	if (!line) error(404, 'No such line.');
	const boards = db.$client
		.prepare(
			`select id, serial, inspected_at as inspectedAt, product_code as productCode, pad_count as pads,
			        fail_count as failed, warn_count as warned, volume_pct_mean as volumePct, height_um_mean as heightUm
			   from spi_boards where line_code = ? order by inspected_at desc limit 20`
		)
		.all(line.code) as {
		id: number;
		serial: string;
		inspectedAt: number;
		productCode: string;
		pads: number;
		failed: number;
		warned: number;
		volumePct: number | null;
		heightUm: number | null;
	}[];
	const signals = (openSignalsByLine(db).get(id) ?? []).map((s) => ({
		...s,
		createdAt: new Date(s.createdAtMs).toISOString()
	}));
	return {
		line,
		boards: boards.map((b) => ({ ...b, inspectedAt: new Date(b.inspectedAt).toISOString() })),
		signals,
		// What the machines reported over CFX (faults, stencil changes, cleaning…), newest first.
		machineEvents: lineMachineEvents(db, id, MACHINE_EVENTS_SHOWN),
		lists: getCauseLists(db),
		people: hasRole(actor, SIGNAL_ASSIGNERS) ? assignableUsers(db) : [],
		me: actor.kind === 'user' ? actor.id : null,
		canAcknowledge: hasRole(actor, LINE_ACKNOWLEDGERS),
		canAssign: hasRole(actor, SIGNAL_ASSIGNERS),
		canCorrect: hasRole(actor, PRINT_LOGGERS)
	};
};

export const actions = {
	acknowledge: async ({ locals, params, request }) => {
		const actor = requireActor(locals, LINE_ACKNOWLEDGERS);
		const db = getDb();
		// A technician acknowledges what is open on the line in front of them; editors anything.
		const onLine = new Set((openSignalsByLine(db).get(Number(params.id)) ?? []).map((s) => s.id));
		const allowed = hasRole(actor, SPC_EDITORS) ? undefined : (id: number) => onLine.has(id);
		const out = acknowledgeFromForm(db, await request.formData(), actor, allowed);
		return out.ok ? out.body : fail(out.status, out.body);
	},
	assign: async ({ locals, request }) => {
		const actor = requireActor(locals, SIGNAL_ASSIGNERS);
		const form = await request.formData();
		const id = Number(form.get('id'));
		const raw = String(form.get('userId') ?? '');
		const userId = raw === '' ? null : Number(raw);
		if (userId !== null && (!Number.isSafeInteger(userId) || userId <= 0)) {
			return fail(422, { action: 'assign', id, error: 'Choose a person from the list.' });
		}
		try {
			const owner = assignSignal(getDb(), id, userId, actor);
			return {
				action: 'assign',
				id,
				ok: owner.assignee
					? `Signal ${id} is ${owner.assignee.name}'s.`
					: `Signal ${id} has no owner.`
			};
		} catch (err) {
			if (err instanceof AssignError)
				return fail(err.status, { action: 'assign', id, error: err.message });
			throw err;
		}
	}
} satisfies Actions;
