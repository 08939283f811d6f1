/**
 * The floor's in-process event bus. Services publish what changed (an SPI import committed, a
 * run started/ended/corrected, a signal raised/acknowledged/assigned, a paste lot or stencil
 * event); the live overview (live.ts) listens and sends new tiles. Publishing is cheap and never
 * throws: listeners run later (a microtask), so a slow or failing listener never undoes or
 * delays the service's write.
 */

export type FloorEvent =
	| { kind: 'spi-import'; importId: number; boardIds: readonly number[] }
	| { kind: 'run'; what: 'started' | 'ended' | 'corrected'; runId: number }
	| {
			kind: 'signal';
			what: 'raised' | 'acknowledged' | 'assigned' | 'escalated';
			signalIds: readonly number[];
	  }
	| { kind: 'paste-lot'; lotId: number }
	| { kind: 'stencil'; stencilId: number }
	/** Machines reported line events over CFX (a fault, a stencil change, work started…). */
	| { kind: 'machine'; lineIds: readonly number[] };

/** An event with the time it was published (epoch ms), for the delay figures. */
export type PublishedFloorEvent = FloorEvent & { publishedAtMs: number };

type Listener = (event: PublishedFloorEvent) => void;

const listeners = new Set<Listener>();

/** Events not yet taken by the tile cache; past MAX_UNREAD the cache is told to drop everything. */
const MAX_UNREAD = 10_000;
let unread: PublishedFloorEvent[] = [];
let unreadOverflow = false;

/** The events published since the last call (for the tile cache), and whether some were dropped. */
export function takePublishedEvents(): { events: PublishedFloorEvent[]; overflow: boolean } {
	const out = { events: unread, overflow: unreadOverflow };
	unread = [];
	unreadOverflow = false;
	return out;
}

/**
 * Tell the floor something changed. Call after the write is committed.
 * @example publishFloorEvent({ kind: 'run', what: 'started', runId: 12 })
 */
export function publishFloorEvent(event: FloorEvent): void {
	const published = { ...event, publishedAtMs: Date.now() } as PublishedFloorEvent;
	// Kept synchronously for the tile cache (overview.ts), so a read right after a write sees it.
	if (unread.length < MAX_UNREAD) unread.push(published);
	else unreadOverflow = true;
	if (listeners.size === 0) return;
	queueMicrotask(() => {
		for (const listener of listeners) {
			try {
				listener(published);
			} catch (err) {
				console.error('[floor] event listener failed', err);
			}
		}
	});
}

/** Listen to floor events; returns the function that stops listening. */
export function subscribeFloorEvents(listener: Listener): () => void {
	listeners.add(listener);
	return () => listeners.delete(listener);
}
