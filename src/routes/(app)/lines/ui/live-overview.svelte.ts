import type { LineTile } from '$lib/floor/tile';

/** No event (not even a heartbeat, sent every 15 s) for this long: the connection is lost. */
const SILENCE_MS = 40_000;
/** Reconnection waits after a refused or dead stream, growing to the last. */
const BACKOFF_MS = [1_000, 2_000, 5_000, 10_000, 20_000];

/**
 * The overview as the browser keeps it: the tiles fetched from `GET /api/lines/overview`, then
 * kept current by `GET /api/lines/stream`. The browser's EventSource reconnects by itself after a
 * dropped connection (sending Last-Event-ID); when the server refuses it or goes silent, this
 * reconnects with back-off and resumes from the last id it saw. `lostSince` is set while the
 * stream is down.
 */
export class LiveOverview {
	tiles = $state<LineTile[]>([]);
	connected = $state(false);
	lostSince = $state<Date | null>(null);
	/** When the newest data arrived (fetch or event). */
	updatedAt = $state<Date | null>(null);
	error = $state<string | null>(null);
	/** Bumped on every `signal` event, for views that list signals. */
	signalEvents = $state(0);

	#source: EventSource | null = null;
	#lastEventId: string | null = null;
	#lastMessageMs = 0;
	#watchdog: ReturnType<typeof setInterval> | null = null;
	#retry: ReturnType<typeof setTimeout> | null = null;
	#attempt = 0;
	#stopped = false;

	constructor(private readonly options: { token?: string | null; lineId?: number | null } = {}) {}

	#url(path: string, extra: Record<string, string> = {}): string {
		const params = new URLSearchParams(extra);
		if (this.options.token) params.set('token', this.options.token);
		const query = params.toString();
		return query ? `${path}?${query}` : path;
	}

	#accept(tile: LineTile): void {
		if (this.options.lineId && tile.lineId !== this.options.lineId) return;
		const at = this.tiles.findIndex((t) => t.lineId === tile.lineId);
		if (at === -1) {
			this.tiles = [...this.tiles, tile].sort((a, b) =>
				a.lineCode.localeCompare(b.lineCode, 'en', { numeric: true })
			);
		} else this.tiles[at] = tile;
		this.updatedAt = new Date();
	}

	async #fetchOverview(): Promise<void> {
		try {
			const response = await fetch(this.#url('/api/lines/overview'), {
				headers: { accept: 'application/json' }
			});
			if (!response.ok) {
				this.error = `The overview could not be loaded (${response.status}).`;
				return;
			}
			const body = (await response.json()) as { lines: LineTile[] };
			for (const tile of body.lines) this.#accept(tile);
			this.error = null;
		} catch {
			this.error = 'The overview could not be loaded (no connection).';
		}
	}

	#lost(): void {
		this.connected = false;
		this.lostSince ??= new Date();
	}

	#open(): void {
		if (this.#stopped) return;
		this.#source?.close();
		// A new EventSource cannot send Last-Event-ID itself: the stream also takes it in the query.
		const url = this.#url(
			'/api/lines/stream',
			this.#lastEventId ? { lastEventId: this.#lastEventId } : {}
		);
		const source = new EventSource(url);
		this.#source = source;
		const seen = (e: MessageEvent) => {
			this.#lastMessageMs = Date.now();
			if (e.lastEventId) this.#lastEventId = e.lastEventId;
			if (!this.connected) {
				this.connected = true;
				this.lostSince = null;
				this.#attempt = 0;
			}
		};
		source.addEventListener('open', () => {
			this.#lastMessageMs = Date.now();
		});
		source.addEventListener('line', (e) => {
			seen(e as MessageEvent);
			try {
				this.#accept(JSON.parse((e as MessageEvent).data) as LineTile);
			} catch {
				/* a broken event is skipped; the next tile of that line replaces it */
			}
		});
		source.addEventListener('signal', (e) => {
			seen(e as MessageEvent);
			this.signalEvents++;
		});
		source.addEventListener('heartbeat', (e) => seen(e as MessageEvent));
		source.addEventListener('snapshot', (e) => seen(e as MessageEvent));
		source.addEventListener('error', () => {
			this.#lost();
			// CLOSED: the browser gave up (the server refused); reconnect ourselves.
			if (source.readyState === EventSource.CLOSED) this.#scheduleReconnect();
		});
	}

	#scheduleReconnect(): void {
		if (this.#stopped || this.#retry) return;
		const wait = BACKOFF_MS[Math.min(this.#attempt, BACKOFF_MS.length - 1)];
		this.#attempt++;
		this.#retry = setTimeout(() => {
			this.#retry = null;
			this.#open();
		}, wait);
	}

	/** Load the tiles, then listen. Call from onMount / $effect. */
	start(): void {
		this.#stopped = false;
		void this.#fetchOverview().then(() => this.#open());
		this.#watchdog = setInterval(() => {
			if (!this.#source || this.#lastMessageMs === 0) return;
			if (Date.now() - this.#lastMessageMs > SILENCE_MS) {
				this.#lost();
				this.#source.close();
				this.#source = null;
				this.#scheduleReconnect();
			}
		}, 5_000);
	}

	stop(): void {
		this.#stopped = true;
		this.#source?.close();
		this.#source = null;
		if (this.#watchdog) clearInterval(this.#watchdog);
		if (this.#retry) clearTimeout(this.#retry);
		this.#retry = null;
	}
}
