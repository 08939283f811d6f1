import { randomBytes } from 'node:crypto';
import type { LineTile } from '$lib/floor/tile';
import type { Db } from '../db';
import { subscribeFloorEvents, type PublishedFloorEvent } from './events';
import { linesOfEvent } from './lines-of';
import { lineTiles } from './overview';

/**
 * The live overview: turns floor events into `line` events (a tile's JSON) and `signal` events,
 * keeps the last RING_SIZE of them with ids for `Last-Event-ID` resumption, and writes them to
 * every open stream. Events of one line within DEBOUNCE_MS make one tile (an import of 50 boards,
 * its signals and the run update send the line once).
 */

export const DEBOUNCE_MS = 250;
export const HEARTBEAT_MS = 15_000;
export const RING_SIZE = 2000;
/** Open streams at most (each holds a socket); more are answered 503. */
export const MAX_STREAMS = 500;
/** A stream whose client reads nothing for this many bytes queued is closed (a stuck reader). */
const MAX_QUEUED_BYTES = 4 * 1024 * 1024;
const STREAM_HIGH_WATER_BYTES = 64 * 1024;

/** One buffered event as sent: `id: <boot>.<seq>`, its name and its JSON. */
export interface StreamEvent {
	seq: number;
	event: 'line' | 'signal';
	data: string;
	/** When the change behind it was published (for the delay figures). */
	publishedAtMs: number | null;
}

/** Changes the server's id prefix on restart, so ids of an earlier process are never resumed. */
const BOOT = randomBytes(4).toString('hex');

let seq = 0;
const ring: StreamEvent[] = [];
const clients = new Set<Client>();
const dirty = new Map<number, number | null>();
let flushTimer: ReturnType<typeof setTimeout> | null = null;
let heartbeat: ReturnType<typeof setInterval> | null = null;
let unsubscribe: (() => void) | null = null;
let liveDb: Db | null = null;

interface Client {
	controller: ReadableStreamDefaultController<Uint8Array>;
	closed: boolean;
}

const encoder = new TextEncoder();

export const eventId = (s: number) => `${BOOT}.${s}`;

function frame(e: StreamEvent): string {
	return `id: ${eventId(e.seq)}\nevent: ${e.event}\ndata: ${e.data}\n\n`;
}

function write(client: Client, text: string): void {
	if (client.closed) return;
	try {
		const queued = STREAM_HIGH_WATER_BYTES - (client.controller.desiredSize ?? 0);
		if (queued > MAX_QUEUED_BYTES) {
			client.closed = true;
			clients.delete(client);
			client.controller.close();
			return;
		}
		client.controller.enqueue(encoder.encode(text));
	} catch {
		client.closed = true;
		clients.delete(client);
	}
}

function append(
	event: StreamEvent['event'],
	payload: unknown,
	publishedAtMs: number | null
): StreamEvent {
	const e: StreamEvent = { seq: ++seq, event, data: JSON.stringify(payload), publishedAtMs };
	ring.push(e);
	if (ring.length > RING_SIZE) ring.splice(0, ring.length - RING_SIZE);
	const text = frame(e);
	for (const client of clients) write(client, text);
	return e;
}

function onEvent(e: PublishedFloorEvent): void {
	const db = liveDb;
	if (!db) return;
	let lineIds: number[];
	try {
		lineIds = linesOfEvent(db, e);
	} catch (err) {
		console.error('[floor] could not find the lines of an event', err);
		return;
	}
	if (e.kind === 'signal') {
		append(
			'signal',
			{
				what: e.what,
				signalIds: e.signalIds,
				lineIds,
				at: new Date(e.publishedAtMs).toISOString()
			},
			e.publishedAtMs
		);
	}
	for (const id of lineIds) {
		// Keep the first publish time of a burst: the delay is counted from the earliest change.
		if (!dirty.has(id)) dirty.set(id, e.publishedAtMs);
	}
	if (dirty.size && !flushTimer) flushTimer = setTimeout(flush, DEBOUNCE_MS);
}

function flush(): void {
	flushTimer = null;
	const db = liveDb;
	if (!db || dirty.size === 0) return;
	const batch = new Map(dirty);
	dirty.clear();
	let tiles: LineTile[];
	try {
		tiles = lineTiles(db, Date.now(), [...batch.keys()]);
	} catch (err) {
		console.error('[floor] tiles for the stream failed', err);
		return;
	}
	for (const tile of tiles) append('line', tile, batch.get(tile.lineId) ?? null);
}

/** Start listening to floor events (once per process); the stream and startup call it. */
export function startLiveOverview(db: Db): void {
	liveDb = db;
	if (unsubscribe) return;
	unsubscribe = subscribeFloorEvents(onEvent);
	heartbeat = setInterval(() => {
		const text = `event: heartbeat\ndata: {"at":"${new Date().toISOString()}"}\n\n`;
		for (const client of clients) write(client, text);
	}, HEARTBEAT_MS);
	heartbeat.unref?.();
}

/** Stop listening and close every stream (tests, shutdown). */
export function stopLiveOverview(): void {
	unsubscribe?.();
	unsubscribe = null;
	if (heartbeat) clearInterval(heartbeat);
	heartbeat = null;
	if (flushTimer) clearTimeout(flushTimer);
	flushTimer = null;
	dirty.clear();
	for (const client of clients) {
		client.closed = true;
		try {
			client.controller.close();
		} catch {
			/* already closed by the client */
		}
	}
	clients.clear();
}

/** Events after `lastEventId` when they are all still buffered; null when it cannot resume. */
export function eventsAfter(lastEventId: string | null): StreamEvent[] | null {
	if (!lastEventId) return null;
	const m = /^([0-9a-f]{8})\.(\d{1,15})$/.exec(lastEventId.trim());
	if (!m || m[1] !== BOOT) return null;
	const after = Number(m[2]);
	if (after > seq) return null;
	if (after === seq) return [];
	const oldest = ring[0]?.seq ?? seq + 1;
	// The next event after the client's last one was dropped from the ring: a gap, no resume.
	if (after + 1 < oldest) return null;
	return ring.filter((e) => e.seq > after);
}

/** Open streams now (the benchmark prints it). */
export const openStreams = () => clients.size;

/**
 * A `text/event-stream` response: `retry`, then the missed events (resumed from
 * `Last-Event-ID`) or every line's tile (a fresh start or a gap), then live events and a
 * `heartbeat` event every 15 s. Ends when the client goes away.
 */
export function openStream(db: Db, lastEventId: string | null): Response {
	startLiveOverview(db);
	if (clients.size >= MAX_STREAMS) {
		return new Response(
			JSON.stringify({ error: `Too many open streams (${MAX_STREAMS}); try again later.` }),
			{
				status: 503,
				headers: { 'content-type': 'application/json', 'retry-after': '30' }
			}
		);
	}
	let client: Client;
	const stream = new ReadableStream<Uint8Array>(
		{
			start(controller) {
				client = { controller, closed: false };
				let head = `retry: 3000\n\n`;
				const missed = eventsAfter(lastEventId);
				if (missed) {
					for (const e of missed) head += frame(e);
				} else {
					const tiles = lineTiles(db);
					// The snapshot carries the newest id, so a reconnect resumes after it.
					for (const tile of tiles) {
						head += `id: ${eventId(seq)}\nevent: line\ndata: ${JSON.stringify(tile)}\n\n`;
					}
					head += `id: ${eventId(seq)}\nevent: snapshot\ndata: {"lines":${tiles.length}}\n\n`;
				}
				controller.enqueue(encoder.encode(head));
				clients.add(client);
			},
			cancel() {
				client.closed = true;
				clients.delete(client);
			}
		},
		new ByteLengthQueuingStrategy({ highWaterMark: STREAM_HIGH_WATER_BYTES })
	);
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			'x-accel-buffering': 'no',
			connection: 'keep-alive'
		}
	});
}
