import type { Db } from '../db';

/**
 * The lookups the run report and the board trace share: a run's stencil and paste lot by id,
 * and the control-chart signals (with their acknowledgements) matching a condition. One set of
 * statements, prepared once per request and used for every board.
 */

export interface StencilSummary {
	id: number;
	name: string;
	revision: string;
	technology: string;
	thicknessUm: number;
}

export interface LotSummary {
	id: number;
	lotNumber: string;
	alloy: string;
	powderType: number;
}

export interface SignalRow {
	id: number;
	characteristic: string;
	rule: string;
	chartPart: string;
	pointAt: string | null;
	acknowledged: {
		at: string;
		by: string | null;
		cause: string | null;
		action: string | null;
		note: string | null;
	} | null;
}

export const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString());

/** Stencil and paste-lot lookups by id (null for a null id or a missing row). */
export function runContextLookups(db: Db) {
	const c = db.$client;
	const stencilOf = c.prepare(
		`select id, name, revision, technology, thickness_um from stencils where id = ?`
	);
	const lotOf = c.prepare(`select id, lot_number, alloy, powder_type from paste_lots where id = ?`);
	return {
		stencil(id: number | null | undefined): StencilSummary | null {
			const st = id ? (stencilOf.get(id) as Record<string, unknown> | undefined) : undefined;
			return st
				? {
						id: st.id as number,
						name: st.name as string,
						revision: st.revision as string,
						technology: st.technology as string,
						thicknessUm: st.thickness_um as number
					}
				: null;
		},
		lot(id: number | null | undefined): LotSummary | null {
			const lot = id ? (lotOf.get(id) as Record<string, unknown> | undefined) : undefined;
			return lot
				? {
						id: lot.id as number,
						lotNumber: lot.lot_number as string,
						alloy: lot.alloy as string,
						powderType: lot.powder_type as number
					}
				: null;
		}
	};
}

/**
 * A prepared query of signals `where` (SQL over `s` = spc_signals; positional parameters), in
 * `order`, at most `limit`, each with its characteristic's name and its acknowledgement.
 */
export function signalQuery(
	db: Db,
	where: string,
	order: 'oldest first' | 'newest first',
	limit: number
): (...params: unknown[]) => SignalRow[] {
	const statement = db.$client.prepare(
		`select s.id, ch.name as characteristic, s.rule, s.chart_part, s.point_at, s.ack_at, s.ack_by,
		   s.ack_cause, s.ack_action, s.ack_note
		 from spc_signals s join spc_characteristics ch on ch.id = s.characteristic_id
		 where ${where}
		 order by ${order === 'oldest first' ? 's.point_at, s.id' : 's.id desc'} limit ${Math.floor(limit)}`
	);
	return (...params) =>
		(
			statement.all(...params) as {
				id: number;
				characteristic: string;
				rule: string;
				chart_part: string;
				point_at: number | null;
				ack_at: number | null;
				ack_by: string | null;
				ack_cause: string | null;
				ack_action: string | null;
				ack_note: string | null;
			}[]
		).map((s) => ({
			id: s.id,
			characteristic: s.characteristic,
			rule: s.rule,
			chartPart: s.chart_part,
			pointAt: iso(s.point_at),
			acknowledged:
				s.ack_at === null
					? null
					: {
							at: iso(s.ack_at)!,
							by: s.ack_by,
							cause: s.ack_cause,
							action: s.ack_action,
							note: s.ack_note
						}
		}));
}
