/**
 * Storing IPC-CFX messages: one AMQP message in, Rollbead records out, all or nothing.
 *
 * Order of writes (why a redelivery after a crash is harmless): SPI measurements go first through
 * `ingestSpiFile` (the same ingest, rules and signals as files; its content hash makes a second
 * ingest of the same CSV a `duplicate`), then ONE transaction writes every other record together
 * with the message's row in `cfx_messages`. The receiver settles the AMQP message only after this
 * function returns, so a message is either stored and remembered, or redelivered.
 */
import { createHash } from 'node:crypto';
import {
	decodeAmqpBody,
	machineEventWords,
	mapEnvelope,
	spiCsvForUnits,
	type CfxRecord,
	type InspectedUnit
} from '$lib/cfx';
import { formatIngestIssue } from '$lib/ingest';
import { checkRunAgainstRecipe, validateRunParameters, type Deviation } from '$lib/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { publishFloorEvent, type FloorEvent } from '../floor/events';
import { ingestSpiFile, type IngestSource } from '../ingest/ingest-service';
import { currentRecipeFor } from '../printlog/recipes';
import { evaluateChartsForRun } from '../printlog/run-signals';
import { evaluateSignalsAfterPrintRun } from '../spc/signals';
import { productByCode, stencilByName } from '../printlog/lookups';
import { Refusal } from '$lib/errors';

/** The spi_imports.source of CFX measurements (the column is free text; the type names the file routes). */
const CFX_SOURCE = 'cfx' as IngestSource;

export type CfxEndpointKind = 'printer' | 'inspection';
export const CFX_ENDPOINT_KINDS: readonly CfxEndpointKind[] = ['printer', 'inspection'];

export interface CfxEndpoint {
	id: number;
	handle: string;
	lineId: number;
	line: string;
	kind: CfxEndpointKind;
}

/** One AMQP message as the receiver hands it over. */
export interface IncomingCfxMessage {
	messageKey: string;
	body: unknown;
	contentEncoding: string | null;
	receivedAtMs: number;
}

export type StoreOutcome =
	| { status: 'stored'; records: number; sentAtMs: number | null }
	| { status: 'duplicate' }
	| { status: 'quarantined'; reason: string }
	| { status: 'ignored'; reason: string };

/**
 * The key a message is remembered by: its AMQP message-id when the sender set one, else the
 * SHA-256 of its body (a redelivery carries the same bytes).
 */
export function cfxMessageKey(messageId: unknown, bodyBytes: Uint8Array | null): string {
	if (typeof messageId === 'string' && messageId.trim() !== '' && messageId.length <= 200) {
		return `id:${messageId.trim()}`;
	}
	if (typeof messageId === 'number' && Number.isSafeInteger(messageId)) return `id:${messageId}`;
	if (messageId instanceof Uint8Array && messageId.byteLength <= 64) {
		return `id:${Buffer.from(messageId).toString('hex')}`;
	}
	return `sha256:${createHash('sha256')
		.update(bodyBytes ?? new Uint8Array())
		.digest('hex')}`;
}

/** The body as bytes for the quarantine list and the hash (bounded by the decoder's limit). */
export function bodyBytes(body: unknown): Uint8Array | null {
	if (body instanceof Uint8Array) return body;
	if (typeof body === 'string') return Buffer.from(body, 'utf8');
	if (body === null || body === undefined) return null;
	try {
		return Buffer.from(JSON.stringify(body) ?? '', 'utf8');
	} catch {
		return null;
	}
}

export function listEndpoints(db: Db): CfxEndpoint[] {
	return db.$client
		.prepare(
			`select e.id, e.handle, e.line_id as lineId, l.code as line, e.kind
			   from cfx_endpoints e join lines l on l.id = e.line_id order by l.code, e.handle`
		)
		.all() as CfxEndpoint[];
}

function endpointByHandle(db: Db, handle: string): CfxEndpoint | undefined {
	return db.$client
		.prepare(
			`select e.id, e.handle, e.line_id as lineId, l.code as line, e.kind
			   from cfx_endpoints e join lines l on l.id = e.line_id where e.handle = ?`
		)
		.get(handle) as CfxEndpoint | undefined;
}

export class CfxInputError extends Refusal {
	constructor(
		readonly status: 404 | 409 | 422,
		readonly field: string,
		message: string
	) {
		super(message);
	}

	/** Answered `{ error, fields: [{ field, message }] }` by errorResponse. */
	override get fieldProblems() {
		return [{ field: this.field, message: this.message }];
	}
}

/**
 * Map a machine's handle to a line (a new handle, or a new line/kind for a known one).
 * @throws CfxInputError 422 unknown line
 */
export function saveEndpoint(
	db: Db,
	input: { handle: string; line: string; kind: CfxEndpointKind },
	actor: Parameters<typeof recordAudit>[1]
): { endpoint: CfxEndpoint; created: boolean } {
	const line = db.$client
		.prepare(`select id, code from lines where upper(trim(code)) = upper(trim(?))`)
		.get(input.line) as { id: number; code: string } | undefined;
	if (!line) throw new CfxInputError(422, 'line', `no line has the code "${input.line}"`);
	return db.transaction((tx) => {
		const before = endpointByHandle(db, input.handle);
		if (before) {
			db.$client
				.prepare(`update cfx_endpoints set line_id = ?, kind = ? where id = ?`)
				.run(line.id, input.kind, before.id);
		} else {
			db.$client
				.prepare(
					`insert into cfx_endpoints (handle, line_id, kind, created_by_user_id) values (?, ?, ?, ?)`
				)
				.run(input.handle, line.id, input.kind, actor?.kind === 'user' ? actor.id : null);
		}
		const endpoint = endpointByHandle(db, input.handle)!;
		recordAudit(tx, actor, {
			action: before ? 'update' : 'create',
			entity: 'cfx_endpoint',
			entityId: endpoint.id,
			before: before ? { line: before.line, kind: before.kind } : undefined,
			after: { handle: endpoint.handle, line: endpoint.line, kind: endpoint.kind }
		});
		return { endpoint, created: !before };
	});
}

/** Whether a message with this key was already settled (stored, quarantined or ignored). */
function seen(db: Db, key: string): boolean {
	return (
		db.$client.prepare(`select 1 from cfx_messages where message_key = ?`).get(key) !== undefined
	);
}

function quarantine(
	db: Db,
	msg: IncomingCfxMessage,
	handle: string | null,
	messageName: string | null,
	reason: string,
	retryOf: number | null
): StoreOutcome {
	const bytes = bodyBytes(msg.body);
	db.$client.transaction(() => {
		if (retryOf !== null) {
			// A retry that fails again keeps the same held row with the new reason.
			db.$client
				.prepare(`update cfx_quarantine set reason = ?, handle = ?, message_name = ? where id = ?`)
				.run(reason, handle, messageName, retryOf);
			return;
		}
		db.$client
			.prepare(
				`insert into cfx_quarantine (message_key, received_at, handle, message_name, reason, body, content_encoding)
				 values (?, ?, ?, ?, ?, ?, ?)`
			)
			.run(
				msg.messageKey,
				msg.receivedAtMs,
				handle,
				messageName,
				reason,
				bytes ? Buffer.from(bytes) : null,
				msg.contentEncoding
			);
		db.$client
			.prepare(
				`insert into cfx_messages (message_key, received_at, outcome, handle, message_names) values (?, ?, 'quarantined', ?, ?)`
			)
			.run(msg.messageKey, msg.receivedAtMs, handle, messageName ?? '');
	})();
	return { status: 'quarantined', reason };
}

interface OpenRun {
	id: number;
	productId: number;
	productCode: string;
	stencilId: number | null;
	stencilName: string | null;
}

function openRunOnLine(db: Db, lineId: number): OpenRun | undefined {
	return db.$client
		.prepare(
			`select r.id, r.product_id as productId, p.code as productCode, r.stencil_id as stencilId, s.name as stencilName
			   from print_runs r join products p on p.id = r.product_id left join stencils s on s.id = r.stencil_id
			  where r.line_id = ? and r.ended_at is null`
		)
		.get(lineId) as OpenRun | undefined;
}

/** The stencil a line's printer last reported loading (StencilChanged), if Rollbead knows it. */
function currentStencilOfLine(db: Db, lineId: number): { id: number; name: string } | undefined {
	const row = db.$client
		.prepare(
			`select json_extract(detail, '$.newName') as name from cfx_line_events
			  where line_id = ? and kind = 'stencil-changed' order by at desc, id desc limit 1`
		)
		.get(lineId) as { name: string | null } | undefined;
	if (!row?.name) return undefined;
	const ref = stencilByName(db, row.name);
	return ref ? { id: ref.id, name: ref.name } : undefined;
}

/**
 * The product of a unit on a line: the open print run's, else the recipe name when it is a
 * product code (case-insensitive), else unknown.
 */
function productFor(
	db: Db,
	lineId: number,
	recipeName: string | null
): { productId: number; productCode: string; run: OpenRun | null } | null {
	const run = openRunOnLine(db, lineId);
	if (run) return { productId: run.productId, productCode: run.productCode, run };
	const product = recipeName ? productByCode(db, recipeName) : undefined;
	return product ? { productId: product.id, productCode: product.code, run: null } : null;
}

type Pending = {
	events: FloorEvent[];
	/** Products and lines that got a board printed outside the recipe window (charts to judge). */
	deviating?: Map<string, { productId: number; lineId: number }>;
};

/**
 * Open a print run from the printer's messages (no run open on the line, the recipe names a
 * product): the line's current stencil when known, the recipe version of now, parameters of the
 * first board. Audited as the system; a 'run-opened' line event marks it as CFX-opened.
 */
function openMachineRun(
	db: Db,
	ep: CfxEndpoint,
	product: { productId: number; productCode: string },
	atMs: number,
	parameters: Record<string, unknown>,
	messageKey: string,
	out: Pending
): OpenRun {
	const recipe = currentRecipeFor(db, ep.lineId, product.productId);
	const stencil = currentStencilOfLine(db, ep.lineId);
	const warnings = [`opened from CFX messages of ${ep.handle}`];
	if (!stencil)
		warnings.push('stencil not reported by the printer (StencilChanged) or unknown to Rollbead');
	const id = Number(
		db.$client
			.prepare(
				`insert into print_runs (line_id, product_id, stencil_id, parameters, started_at, recipe_id, recipe_version, warnings)
				 values (?, ?, ?, ?, ?, ?, ?, ?)`
			)
			.run(
				ep.lineId,
				product.productId,
				stencil?.id ?? null,
				JSON.stringify(parameters),
				atMs,
				recipe?.id ?? null,
				recipe?.version ?? null,
				JSON.stringify(warnings)
			).lastInsertRowid
	);
	recordAudit(db, null, {
		action: 'start',
		entity: 'print_run',
		entityId: id,
		after: {
			source: 'cfx',
			handle: ep.handle,
			product: product.productCode,
			stencil: stencil?.name ?? null
		}
	});
	lineEvent(db, ep, 'run-opened', atMs, { runId: id, product: product.productCode }, messageKey);
	out.events.push({ kind: 'run', what: 'started', runId: id });
	return {
		id,
		productId: product.productId,
		productCode: product.productCode,
		stencilId: stencil?.id ?? null,
		stencilName: stencil?.name ?? null
	};
}

function lineEvent(
	db: Db,
	ep: CfxEndpoint,
	kind: string,
	atMs: number,
	detail: Record<string, unknown>,
	messageKey: string
): void {
	db.$client
		.prepare(
			`insert into cfx_line_events (line_id, endpoint_id, kind, at, detail, message_key) values (?, ?, ?, ?, ?, ?)`
		)
		.run(ep.lineId, ep.id, kind, atMs, JSON.stringify(detail), messageKey);
}

/** The unit row of this transaction, else the newest of this board position on the endpoint. */
function unitRow(
	db: Db,
	ep: CfxEndpoint,
	unitIdentifier: string,
	positionNumber: number,
	transactionId: string | null,
	open: 'started' | 'processed' | 'completed' | 'departed' | null
): { id: number } | undefined {
	if (transactionId) {
		const byTx = db.$client
			.prepare(
				`select id from cfx_units where endpoint_id = ? and unit_identifier = ? and position_number = ? and transaction_id = ?`
			)
			.get(ep.id, unitIdentifier, positionNumber, transactionId) as { id: number } | undefined;
		if (byTx) return byTx;
	}
	const column = open ? `${open}_at` : null;
	return db.$client
		.prepare(
			`select id from cfx_units where endpoint_id = ? and unit_identifier = ? and position_number = ?
			 ${column ? `and ${column} is null` : ''} order by id desc limit 1`
		)
		.get(ep.id, unitIdentifier, positionNumber) as { id: number } | undefined;
}

function newUnit(
	db: Db,
	ep: CfxEndpoint,
	unitIdentifier: string,
	positionNumber: number,
	transactionId: string | null
): number {
	return Number(
		db.$client
			.prepare(
				`insert into cfx_units (endpoint_id, line_id, unit_identifier, position_number, transaction_id) values (?, ?, ?, ?, ?)`
			)
			.run(ep.id, ep.lineId, unitIdentifier, positionNumber, transactionId).lastInsertRowid
	);
}

/** Write one record (inside the message's transaction). SPI records were handled before. */
function applyRecord(
	db: Db,
	ep: CfxEndpoint,
	rec: CfxRecord,
	messageKey: string,
	out: Pending
): void {
	const at = rec.atMs;
	switch (rec.kind) {
		case 'work-started': {
			const product = productFor(db, ep.lineId, null);
			for (const u of rec.units) {
				const row = unitRow(
					db,
					ep,
					u.unitIdentifier,
					u.positionNumber,
					rec.transactionId,
					'started'
				);
				const id =
					row?.id ?? newUnit(db, ep, u.unitIdentifier, u.positionNumber, rec.transactionId);
				db.$client
					.prepare(
						`update cfx_units set transaction_id = ?, started_at = ?, print_run_id = coalesce(print_run_id, ?),
						        product_id = coalesce(product_id, ?) where id = ?`
					)
					.run(rec.transactionId, at, product?.run?.id ?? null, product?.productId ?? null, id);
			}
			lineEvent(
				db,
				ep,
				'work-started',
				at,
				{ transactionId: rec.transactionId, units: rec.units.length },
				messageKey
			);
			return;
		}
		case 'units-processed': {
			for (const u of rec.units) {
				const recipeName = u.recipeName ?? rec.recipeName;
				let product = productFor(db, ep.lineId, recipeName);
				if (product && !product.run && ep.kind === 'printer') {
					const run = openMachineRun(db, ep, product, at, { ...u.parameters }, messageKey, out);
					product = { ...product, run };
				}
				let deviations: Deviation[] = [];
				if (product) {
					const recipe = currentRecipeFor(db, ep.lineId, product.productId);
					if (recipe) {
						deviations = checkRunAgainstRecipe(
							{ ...u.parameters },
							{
								line: ep.line,
								product: product.productCode,
								parameters: recipe.parameters
							}
						).deviations;
					}
				}
				if (product && deviations.some((d) => d.kind === 'numeric')) {
					out.deviating ??= new Map();
					out.deviating.set(`${product.productId}:${ep.lineId}`, {
						productId: product.productId,
						lineId: ep.lineId
					});
				}
				const row = unitRow(
					db,
					ep,
					u.unitIdentifier,
					u.positionNumber,
					rec.transactionId,
					'processed'
				);
				const id =
					row?.id ?? newUnit(db, ep, u.unitIdentifier, u.positionNumber, rec.transactionId);
				db.$client
					.prepare(
						`update cfx_units set transaction_id = coalesce(transaction_id, ?), processed_at = ?, result = ?,
						        parameters = ?, deviations = ?, cycle_time_ms = ?, recipe_name = ?,
						        print_run_id = coalesce(?, print_run_id), product_id = coalesce(?, product_id) where id = ?`
					)
					.run(
						rec.transactionId,
						at,
						u.result,
						JSON.stringify({
							...u.parameters,
							printOffsets: u.printOffsets,
							firstPrintDirection: u.firstPrintDirection
						}),
						JSON.stringify(deviations),
						u.cycleTimeMs,
						recipeName,
						product?.run?.id ?? null,
						product?.productId ?? null,
						id
					);
			}
			return;
		}
		case 'work-completed': {
			const ids = new Set<number>();
			const listed = rec.units.length
				? rec.units.map((u) =>
						unitRow(db, ep, u.unitIdentifier, u.positionNumber, rec.transactionId, 'completed')
					)
				: (db.$client
						.prepare(
							`select id from cfx_units where endpoint_id = ? and transaction_id = ? and completed_at is null`
						)
						.all(ep.id, rec.transactionId) as { id: number }[]);
			for (const row of listed) if (row) ids.add(row.id);
			const runs = new Map<number, number>();
			for (const id of ids) {
				const unit = db.$client
					.prepare(
						`select print_run_id as runId, completed_at as completedAt from cfx_units where id = ?`
					)
					.get(id) as { runId: number | null; completedAt: number | null };
				if (unit.completedAt !== null) continue;
				db.$client
					.prepare(
						`update cfx_units set completed_at = ?, result = coalesce(result, ?) where id = ?`
					)
					.run(at, rec.result, id);
				if (unit.runId !== null && ep.kind === 'printer')
					runs.set(unit.runId, (runs.get(unit.runId) ?? 0) + 1);
			}
			// A board position printed counts once on its run (the stencil's print count follows).
			for (const [runId, n] of runs) {
				db.$client
					.prepare(`update print_runs set boards_printed = boards_printed + ? where id = ?`)
					.run(n, runId);
			}
			lineEvent(
				db,
				ep,
				'work-completed',
				at,
				{ transactionId: rec.transactionId, result: rec.result, units: ids.size },
				messageKey
			);
			return;
		}
		case 'units-arrived':
		case 'units-departed': {
			const arrived = rec.kind === 'units-arrived';
			for (const u of rec.units) {
				const row = unitRow(
					db,
					ep,
					u.unitIdentifier,
					u.positionNumber,
					null,
					arrived ? null : 'departed'
				);
				const fresh = arrived && (!row || hasColumn(db, row.id, 'arrived_at'));
				const id =
					fresh || !row ? newUnit(db, ep, u.unitIdentifier, u.positionNumber, null) : row.id;
				db.$client
					.prepare(
						`update cfx_units set ${arrived ? 'arrived_at' : 'departed_at'} = ? where id = ?`
					)
					.run(at, id);
			}
			return;
		}
		case 'stencil-cleaned': {
			const stencil = rec.toolName ? stencilByName(db, rec.toolName) : undefined;
			if (stencil) {
				db.$client
					.prepare(
						`insert into stencil_events (stencil_id, kind, at, detail, note, actor) values (?, 'cleaning', ?, ?, ?, ?)`
					)
					.run(
						stencil.id,
						at,
						`printer clean${rec.mode ? `, mode ${rec.mode}` : ''}`,
						`CFX StencilCleaned from ${ep.handle}` +
							(rec.cyclesSinceLastClean !== null
								? `; ${rec.cyclesSinceLastClean} prints since the last clean`
								: ''),
						`cfx:${ep.handle}`
					);
				out.events.push({ kind: 'stencil', stencilId: stencil.id });
			}
			lineEvent(
				db,
				ep,
				rec.kind,
				at,
				{
					stencil: rec.toolName,
					known: !!stencil,
					mode: rec.mode,
					cyclesSinceLastClean: rec.cyclesSinceLastClean,
					durationMs: rec.durationMs
				},
				messageKey
			);
			return;
		}
		case 'stencil-changed': {
			// A stencil change ends a run CFX opened (the next board opens one with the new stencil).
			const open = openRunOnLine(db, ep.lineId);
			if (open && cfxOpened(db, open.id)) {
				db.$client
					.prepare(
						`update print_runs set ended_at = ? where id = ? and ended_at is null and started_at <= ?`
					)
					.run(at, open.id, at);
				out.events.push({ kind: 'run', what: 'ended', runId: open.id });
			}
			lineEvent(db, ep, rec.kind, at, { oldName: rec.oldName, newName: rec.newName }, messageKey);
			return;
		}
		case 'squeegee-changed':
		case 'tool-changed':
			lineEvent(db, ep, rec.kind, at, { oldName: rec.oldName, newName: rec.newName }, messageKey);
			return;
		case 'squeegee-cleaned':
			lineEvent(
				db,
				ep,
				rec.kind,
				at,
				{ squeegee: rec.toolName, mode: rec.mode, durationMs: rec.durationMs },
				messageKey
			);
			return;
		case 'fault-occurred':
			lineEvent(
				db,
				ep,
				'fault',
				at,
				{
					faultId: rec.faultId,
					code: rec.code,
					cause: rec.cause,
					severity: rec.severity,
					description: rec.description
				},
				messageKey
			);
			return;
		case 'fault-cleared':
			lineEvent(db, ep, 'fault-cleared', at, { faultId: rec.faultId }, messageKey);
			return;
		case 'station-state-changed':
			lineEvent(
				db,
				ep,
				'station-state',
				at,
				{
					oldState: rec.oldState,
					newState: rec.newState,
					oldStateDurationMs: rec.oldStateDurationMs
				},
				messageKey
			);
			return;
		case 'units-inspected':
			return; // stored before the transaction (ingestSpiFile)
	}
}

function hasColumn(db: Db, id: number, column: 'arrived_at'): boolean {
	const row = db.$client.prepare(`select ${column} as v from cfx_units where id = ?`).get(id) as {
		v: number | null;
	};
	return row.v !== null;
}

function cfxOpened(db: Db, runId: number): boolean {
	return (
		db.$client
			.prepare(
				`select 1 from cfx_line_events where kind = 'run-opened' and json_extract(detail, '$.runId') = ?`
			)
			.get(runId) !== undefined
	);
}

/**
 * The product and print run of an inspected unit: the printed unit with the same identifier on
 * the line (SPI results join their print by unit identifier, not by transaction), else the open
 * run on the line, else the recipe name when it is a product code.
 */
function inspectedUnitContext(
	db: Db,
	ep: CfxEndpoint,
	unitIdentifier: string,
	recipeName: string | null
): {
	productId: number;
	productCode: string;
	runId: number | null;
	stencilName: string | null;
} | null {
	const printed = db.$client
		.prepare(
			`select u.product_id as productId, p.code as productCode, u.print_run_id as runId, s.name as stencilName
			   from cfx_units u join products p on p.id = u.product_id
			   left join print_runs r on r.id = u.print_run_id left join stencils s on s.id = r.stencil_id
			  where u.line_id = ? and u.unit_identifier = ? and u.product_id is not null order by u.id desc limit 1`
		)
		.get(ep.lineId, unitIdentifier) as
		| { productId: number; productCode: string; runId: number | null; stencilName: string | null }
		| undefined;
	if (printed) return printed;
	const product = productFor(db, ep.lineId, recipeName);
	if (!product) return null;
	return {
		productId: product.productId,
		productCode: product.productCode,
		runId: product.run?.id ?? null,
		stencilName: product.run
			? product.run.stencilName
			: (currentStencilOfLine(db, ep.lineId)?.name ?? null)
	};
}

/** The SPI part of a message: ingest the units whose product is known, hold the others. */
async function storeInspections(
	db: Db,
	ep: CfxEndpoint,
	rec: Extract<CfxRecord, { kind: 'units-inspected' }>,
	messageKey: string
): Promise<{ pending: InspectedUnit[][] } | { reason: string }> {
	// One CSV per (product, run, stencil): a board's rows must agree on them.
	const groups = new Map<
		string,
		{ ctx: NonNullable<ReturnType<typeof inspectedUnitContext>>; units: InspectedUnit[] }
	>();
	const unknown = new Map<string, InspectedUnit[]>();
	for (const u of rec.units) {
		if (u.pads.length === 0) continue;
		const ctx = inspectedUnitContext(db, ep, u.unitIdentifier, rec.recipeName);
		if (!ctx) {
			unknown.set(u.unitIdentifier, [...(unknown.get(u.unitIdentifier) ?? []), u]);
			continue;
		}
		const key = `${ctx.productId}|${ctx.runId}|${ctx.stencilName}`;
		const group = groups.get(key) ?? { ctx, units: [] };
		group.units.push(u);
		groups.set(key, group);
	}
	let part = 0;
	for (const { ctx, units } of groups.values()) {
		const csv = spiCsvForUnits(units, {
			inspectedAtMs: rec.atMs,
			lineCode: ep.line,
			productCode: ctx.productCode,
			stencilName: ctx.stencilName,
			printRunId: ctx.runId
		});
		const outcome = await ingestSpiFile(db, {
			source: CFX_SOURCE,
			fileName: `cfx-${ep.handle}-${messageKey.slice(0, 60)}${groups.size > 1 ? `-${++part}` : ''}.csv`,
			body: (async function* () {
				yield Buffer.from(csv, 'utf8');
			})(),
			createdBy: `cfx:${ep.handle}`,
			totalBytes: Buffer.byteLength(csv)
		});
		if (outcome.status === 'rejected') {
			const first = outcome.errors.slice(0, 3).map(formatIngestIssue).join('; ');
			return {
				reason: `SPI ingest refused the measurements (${outcome.errorCount} error(s)): ${first}`
			};
		}
	}
	return { pending: [...unknown.values()] };
}

/**
 * Store one AMQP message. Never throws for message content (it quarantines with a reason); a
 * server fault (disk full) throws and the receiver leaves the message unsettled.
 * `retryOf`: the quarantine row being retried (skips the redelivery check).
 */
/** Record kinds that add a line event (cfx_line_events). */
const LINE_EVENT_KINDS: ReadonlySet<CfxRecord['kind']> = new Set([
	'work-started',
	'work-completed',
	'stencil-changed',
	'squeegee-changed',
	'tool-changed',
	'stencil-cleaned',
	'squeegee-cleaned',
	'fault-occurred',
	'fault-cleared',
	'station-state-changed'
]);

export async function storeCfxMessage(
	db: Db,
	msg: IncomingCfxMessage,
	options: { retryOf?: number } = {}
): Promise<StoreOutcome> {
	const retryOf = options.retryOf ?? null;
	if (retryOf === null && seen(db, msg.messageKey)) return { status: 'duplicate' };
	const decoded = decodeAmqpBody(msg.body, msg.contentEncoding);
	if (!decoded.ok) return quarantine(db, msg, null, null, decoded.reason, retryOf);
	const records: { rec: CfxRecord; ep: CfxEndpoint }[] = [];
	const ignored: string[] = [];
	for (const env of decoded.envelopes) {
		const mapped = mapEnvelope(env);
		if (mapped.status === 'quarantine')
			return quarantine(db, msg, env.source, env.messageName, mapped.reason, retryOf);
		const ep = endpointByHandle(db, env.source);
		if (!ep) {
			return quarantine(
				db,
				msg,
				env.source,
				env.messageName,
				`handle "${env.source}" is not mapped to a line (add it under Admin → Machine messages)`,
				retryOf
			);
		}
		if (mapped.status === 'ignored') ignored.push(mapped.reason);
		else records.push({ rec: mapped.record, ep });
	}
	// Physically impossible print parameters (a speed of 0, 400 kg) are a sender's fault, not a
	// deviation: the message is held, naming the unit and the value.
	for (const { rec } of records) {
		if (rec.kind !== 'units-processed') continue;
		for (const u of rec.units) {
			const errors = validateRunParameters({ ...u.parameters });
			if (errors.length) {
				const what = errors
					.map((e) => `${e.field.replace(/^parameters\./, '')} ${e.message}`)
					.join('; ');
				return quarantine(
					db,
					msg,
					rec.handle,
					rec.messageName,
					`${rec.messageName}: unit ${u.unitIdentifier}: ${what}`,
					retryOf
				);
			}
		}
	}
	const first = decoded.envelopes[0];
	const names = [...new Set(decoded.envelopes.map((e) => e.messageName))].join(',').slice(0, 500);
	// SPI first: idempotent by content, so a crash before the transaction below is harmless.
	const held: {
		ep: CfxEndpoint;
		rec: Extract<CfxRecord, { kind: 'units-inspected' }>;
		units: InspectedUnit[];
	}[] = [];
	for (const { rec, ep } of records) {
		if (rec.kind !== 'units-inspected') continue;
		const result = await storeInspections(db, ep, rec, msg.messageKey);
		if ('reason' in result)
			return quarantine(db, msg, ep.handle, rec.messageName, result.reason, retryOf);
		for (const units of result.pending) held.push({ ep, rec, units });
	}
	const out: Pending = { events: [] };
	db.transaction(() => {
		for (const { rec, ep } of records) applyRecord(db, ep, rec, msg.messageKey, out);
		for (const h of held) {
			db.$client
				.prepare(
					`insert into cfx_pending_inspections (message_key, endpoint_id, line_id, unit_identifier, inspected_at, recipe_name, units, pad_count)
					 values (?, ?, ?, ?, ?, ?, ?, ?)`
				)
				.run(
					msg.messageKey,
					h.ep.id,
					h.ep.lineId,
					h.units[0].unitIdentifier,
					h.rec.atMs,
					h.rec.recipeName,
					JSON.stringify(h.units),
					h.units.reduce((n, u) => n + u.pads.length, 0)
				);
		}
		const outcome = records.length ? 'stored' : 'ignored';
		if (retryOf !== null) {
			db.$client
				.prepare(`update cfx_quarantine set status = 'retried', resolved_at = ? where id = ?`)
				.run(Date.now(), retryOf);
			db.$client
				.prepare(`update cfx_messages set outcome = ?, sent_at = ? where message_key = ?`)
				.run(outcome, first.timeStampMs, msg.messageKey);
		} else {
			db.$client
				.prepare(
					`insert into cfx_messages (message_key, received_at, outcome, handle, message_names, sent_at) values (?, ?, ?, ?, ?, ?)`
				)
				.run(msg.messageKey, msg.receivedAtMs, outcome, first.source, names, first.timeStampMs);
		}
	});
	for (const event of out.events) publishFloorEvent(event);
	// The line view lists machine events live: its tile is sent again, and the page reads them.
	const machineLines = [
		...new Set(records.filter((r) => LINE_EVENT_KINDS.has(r.rec.kind)).map((r) => r.ep.lineId))
	];
	if (machineLines.length) publishFloorEvent({ kind: 'machine', lineIds: machineLines });
	// Print-parameter charts judge runs opened or ended by machines as they judge typed ones.
	for (const event of out.events)
		if (event.kind === 'run') await evaluateChartsForRun(db, event.runId);
	// A board printed outside the recipe window is a point of the print-parameter charts
	// (./board-points): judged, signalled and mailed as a print run's value is.
	for (const scope of out.deviating?.values() ?? []) await evaluateSignalsAfterPrintRun(db, scope);
	if (records.length === 0) return { status: 'ignored', reason: ignored[0] ?? 'nothing to store' };
	return { status: 'stored', records: records.length, sentAtMs: first.timeStampMs };
}

/** How long a settled message's id is remembered (a broker redelivers within minutes or hours). */
export const REMEMBER_IDS_MS = 30 * 24 * 3_600_000;
const PRUNE_BATCH = 5_000;

/**
 * Forget the ids of messages settled before `beforeMs` (quarantine rows stay), a batch at a time
 * so no write holds the database for long. Returns how many were forgotten.
 */
export function pruneReceivedIds(db: Db, beforeMs: number): number {
	let total = 0;
	for (;;) {
		const n = db.$client
			.prepare(
				`delete from cfx_messages where rowid in (select rowid from cfx_messages where received_at < ? and outcome != 'quarantined' limit ${PRUNE_BATCH})`
			)
			.run(beforeMs).changes;
		total += n;
		if (n < PRUNE_BATCH) return total;
	}
}

export interface QuarantinedMessage {
	id: number;
	messageKey: string;
	receivedAt: string;
	handle: string | null;
	messageName: string | null;
	reason: string;
	status: string;
	sizeBytes: number;
}

/** Held messages (newest first), or all when `all`. */
export function listQuarantine(
	db: Db,
	options: { all?: boolean; limit?: number } = {}
): QuarantinedMessage[] {
	const rows = db.$client
		.prepare(
			`select id, message_key as messageKey, received_at as receivedAt, handle, message_name as messageName, reason, status,
			        coalesce(length(body), 0) as sizeBytes
			   from cfx_quarantine ${options.all ? '' : `where status = 'held'`} order by id desc limit ?`
		)
		.all(Math.min(Math.max(options.limit ?? 200, 1), 1000)) as (Omit<
		QuarantinedMessage,
		'receivedAt'
	> & { receivedAt: number })[];
	return rows.map((r) => ({ ...r, receivedAt: new Date(r.receivedAt).toISOString() }));
}

/**
 * Retry a held message (after its handle was mapped or a product created): stored → 'retried';
 * still unmappable → stays held with the new reason.
 * @throws CfxInputError 404 / 409
 */
export async function retryQuarantined(db: Db, id: number): Promise<StoreOutcome> {
	const row = db.$client
		.prepare(
			`select message_key as messageKey, received_at as receivedAt, body, content_encoding as contentEncoding, status from cfx_quarantine where id = ?`
		)
		.get(id) as
		| {
				messageKey: string;
				receivedAt: number;
				body: Buffer | null;
				contentEncoding: string | null;
				status: string;
		  }
		| undefined;
	if (!row) throw new CfxInputError(404, 'id', `no quarantined message #${id}`);
	if (row.status !== 'held')
		throw new CfxInputError(409, 'id', `message #${id} is already ${row.status}`);
	return storeCfxMessage(
		db,
		{
			messageKey: row.messageKey,
			body: row.body,
			contentEncoding: row.contentEncoding,
			receivedAtMs: row.receivedAt
		},
		{ retryOf: id }
	);
}

/** Discard a held message (kept as 'discarded' for the record, body dropped). */
export function discardQuarantined(
	db: Db,
	id: number,
	actor: Parameters<typeof recordAudit>[1]
): void {
	db.transaction((tx) => {
		const row = db.$client
			.prepare(`select status, reason from cfx_quarantine where id = ?`)
			.get(id) as { status: string; reason: string } | undefined;
		if (!row) throw new CfxInputError(404, 'id', `no quarantined message #${id}`);
		if (row.status !== 'held')
			throw new CfxInputError(409, 'id', `message #${id} is already ${row.status}`);
		db.$client
			.prepare(
				`update cfx_quarantine set status = 'discarded', body = null, resolved_at = ?, resolved_by_user_id = ? where id = ?`
			)
			.run(Date.now(), actor?.kind === 'user' ? actor.id : null, id);
		recordAudit(tx, actor, {
			action: 'discard',
			entity: 'cfx_message',
			entityId: id,
			before: { reason: row.reason }
		});
	});
}

/** Counts since the database began: stored, quarantined (held now), ignored, pending units. */
export function cfxCounts(db: Db): {
	stored: number;
	quarantined: number;
	ignored: number;
	pendingUnits: number;
} {
	const c = db.$client
		.prepare(
			`select (select count(*) from cfx_messages where outcome = 'stored') as stored,
			        (select count(*) from cfx_quarantine where status = 'held') as quarantined,
			        (select count(*) from cfx_messages where outcome = 'ignored') as ignored,
			        (select count(*) from cfx_pending_inspections where status = 'pending') as pendingUnits`
		)
		.get() as { stored: number; quarantined: number; ignored: number; pendingUnits: number };
	return c;
}

export interface PendingInspection {
	id: number;
	line: string;
	handle: string;
	unitIdentifier: string;
	inspectedAt: string;
	recipeName: string | null;
	padCount: number;
}

/** Inspected units whose product could not be told, for assignment. */
export function listPendingInspections(db: Db, limit = 200): PendingInspection[] {
	const rows = db.$client
		.prepare(
			`select p.id, l.code as line, e.handle, p.unit_identifier as unitIdentifier, p.inspected_at as inspectedAt,
			        p.recipe_name as recipeName, p.pad_count as padCount
			   from cfx_pending_inspections p join lines l on l.id = p.line_id join cfx_endpoints e on e.id = p.endpoint_id
			  where p.status = 'pending' order by p.inspected_at desc limit ?`
		)
		.all(limit) as (Omit<PendingInspection, 'inspectedAt'> & { inspectedAt: number })[];
	return rows.map((r) => ({ ...r, inspectedAt: new Date(r.inspectedAt).toISOString() }));
}

/**
 * Assign a product to a held inspection: its measurements go through the SPI ingest now.
 * @throws CfxInputError 404 / 409 / 422
 */
export async function assignPendingInspection(
	db: Db,
	id: number,
	productCode: string,
	actor: Parameters<typeof recordAudit>[1]
): Promise<{ importId: number; status: string }> {
	const row = db.$client
		.prepare(
			`select p.status, p.units, p.inspected_at as inspectedAt, p.message_key as messageKey, l.code as line, e.handle
			   from cfx_pending_inspections p join lines l on l.id = p.line_id join cfx_endpoints e on e.id = p.endpoint_id where p.id = ?`
		)
		.get(id) as
		| {
				status: string;
				units: string;
				inspectedAt: number;
				messageKey: string;
				line: string;
				handle: string;
		  }
		| undefined;
	if (!row) throw new CfxInputError(404, 'id', `no held inspection #${id}`);
	if (row.status !== 'pending')
		throw new CfxInputError(409, 'id', `inspection #${id} is already ${row.status}`);
	const product = productByCode(db, productCode);
	if (!product) throw new CfxInputError(422, 'product', `no product has the code "${productCode}"`);
	const csv = spiCsvForUnits(JSON.parse(row.units) as InspectedUnit[], {
		inspectedAtMs: row.inspectedAt,
		lineCode: row.line,
		productCode: product.code,
		stencilName: null,
		printRunId: null
	});
	const outcome = await ingestSpiFile(db, {
		source: CFX_SOURCE,
		fileName: `cfx-${row.handle}-assigned-${id}.csv`,
		body: (async function* () {
			yield Buffer.from(csv, 'utf8');
		})(),
		createdBy: `cfx:${row.handle}`,
		userId: actor?.kind === 'user' ? actor.id : null
	});
	if (outcome.status === 'rejected') {
		throw new CfxInputError(
			422,
			'units',
			`SPI ingest refused the measurements: ${outcome.errors.slice(0, 3).map(formatIngestIssue).join('; ')}`
		);
	}
	db.transaction((tx) => {
		db.$client
			.prepare(
				`update cfx_pending_inspections set status = 'assigned', product_id = ?, import_id = ? where id = ?`
			)
			.run(product.id, outcome.id, id);
		recordAudit(tx, actor, {
			action: 'assign',
			entity: 'cfx_inspection',
			entityId: id,
			after: { product: product.code, importId: outcome.id }
		});
	});
	return { importId: outcome.id, status: outcome.status };
}

/** Recent line events (faults, tool changes, cleaning) of a line, newest first. */
/** Most line events read for one page or answer. */
export const MAX_LINE_EVENTS = 200;

/**
 * A line's machine events, newest first, each with its words (`$lib/cfx/event-words`).
 * @param limit 1–MAX_LINE_EVENTS
 */
export function lineMachineEvents(db: Db, lineId: number | null, limit = 15) {
	const n = Math.min(MAX_LINE_EVENTS, Math.max(1, Math.trunc(limit)));
	return recentLineEvents(db, lineId, n).map((e) => ({
		...e,
		...machineEventWords(e.kind, e.detail)
	}));
}

export function recentLineEvents(db: Db, lineId: number | null, limit = 50) {
	const rows = db.$client
		.prepare(
			`select ev.id, l.code as line, e.handle, ev.kind, ev.at, ev.detail from cfx_line_events ev
			   join lines l on l.id = ev.line_id join cfx_endpoints e on e.id = ev.endpoint_id
			  ${lineId === null ? '' : 'where ev.line_id = ?'} order by ev.at desc, ev.id desc limit ?`
		)
		.all(...(lineId === null ? [limit] : [lineId, limit])) as {
		id: number;
		line: string;
		handle: string;
		kind: string;
		at: number;
		detail: string;
	}[];
	return rows.map((r) => ({
		...r,
		at: new Date(r.at).toISOString(),
		detail: JSON.parse(r.detail) as Record<string, unknown>
	}));
}
