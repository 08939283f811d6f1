/**
 * Reading an AMQP message body into IPC-CFX envelopes (IPC-2591; field names as published in the
 * CFX SDK, repository IPCConnectedFactoryExchange/CFX, release 2.1 / SDK 2.1.1; see
 * reference/cfx/README.md). Bodies are hostile input: sizes are bounded before any work, gzip
 * output is capped (a small bomb never inflates), and every failure is a reason, never a throw.
 */
import { gunzipSync } from 'node:zlib';

/** Largest body accepted as it arrives on the link (compressed or not), bytes. */
export const MAX_BODY_BYTES = 4 * 1024 * 1024;
/** Largest body after gunzip, bytes: a CFX message of a 5,000-pad board is ~2 MB of JSON. */
export const MAX_INFLATED_BYTES = 16 * 1024 * 1024;
/** Most envelopes one AMQP message may carry (a JSON array of envelopes). */
export const MAX_ENVELOPES = 500;
/** Deepest JSON nesting accepted; CFX messages are ~8 levels deep. */
export const MAX_JSON_DEPTH = 32;

/** One CFX envelope as sent: `MessageName`, `TimeStamp`, `UniqueID`, `Source`, `MessageBody`… */
export interface CfxEnvelope {
	messageName: string;
	version: string | null;
	/** Epoch ms of the envelope's `TimeStamp`. */
	timeStampMs: number;
	uniqueId: string | null;
	/** The sender's CFX handle (`Source`), e.g. `fenmoor.line1.printer`. */
	source: string;
	body: Record<string, unknown>;
}

export type DecodeResult = { ok: true; envelopes: CfxEnvelope[] } | { ok: false; reason: string };

const GZIP_MAGIC_0 = 0x1f;
const GZIP_MAGIC_1 = 0x8b;

/**
 * Decode an AMQP body (bytes, text, or an already-parsed value from an AMQP `amqp-value`
 * section) into envelopes. Gzip is recognised by `content-encoding: gzip` or by its magic bytes
 * (the SDK compresses by default); one message may carry a single envelope or an array of them.
 * @example decodeAmqpBody(Buffer.from('{"MessageName":"CFX.Production.WorkStarted",…}')).ok // true
 */
export function decodeAmqpBody(
	body: unknown,
	contentEncoding: string | null | undefined = null
): DecodeResult {
	let text: string;
	if (body === null || body === undefined) return { ok: false, reason: 'empty body' };
	if (typeof body === 'string') {
		if (body.length > MAX_BODY_BYTES) return tooLarge(body.length);
		text = body;
	} else if (body instanceof Uint8Array) {
		if (body.byteLength > MAX_BODY_BYTES) return tooLarge(body.byteLength);
		const encoding = (contentEncoding ?? '').trim().toLowerCase();
		const looksGzip = body.byteLength >= 2 && body[0] === GZIP_MAGIC_0 && body[1] === GZIP_MAGIC_1;
		if (encoding && encoding !== 'gzip' && encoding !== 'identity' && encoding !== 'utf-8') {
			return { ok: false, reason: `unsupported content-encoding "${encoding.slice(0, 40)}"` };
		}
		let bytes: Uint8Array = body;
		if (encoding === 'gzip' || looksGzip) {
			try {
				bytes = gunzipSync(body, { maxOutputLength: MAX_INFLATED_BYTES });
			} catch (err) {
				const code = (err as { code?: string }).code;
				if (code === 'ERR_BUFFER_TOO_LARGE' || /too large|maxOutputLength/i.test(String(err))) {
					return {
						ok: false,
						reason: `gzip body inflates beyond ${MAX_INFLATED_BYTES} bytes (limit)`
					};
				}
				return { ok: false, reason: 'gzip body could not be inflated (corrupt or truncated)' };
			}
		}
		try {
			text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
		} catch {
			return { ok: false, reason: 'body is not valid UTF-8' };
		}
	} else if (typeof body === 'object') {
		// rhea hands an amqp-value map/list over already decoded.
		return envelopesFrom(body);
	} else {
		return { ok: false, reason: `body of type ${typeof body} is not a CFX message` };
	}
	if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
	if (text.trim() === '') return { ok: false, reason: 'empty body' };
	let parsed: unknown;
	try {
		parsed = JSON.parse(text);
	} catch (err) {
		return {
			ok: false,
			reason: `body is not JSON: ${String((err as Error).message).slice(0, 120)}`
		};
	}
	return envelopesFrom(parsed);
}

function tooLarge(size: number): DecodeResult {
	return { ok: false, reason: `body of ${size} bytes exceeds the ${MAX_BODY_BYTES}-byte limit` };
}

function depthOf(value: unknown, limit: number): number {
	// Iterative, so a hostile 100,000-deep array cannot overflow the stack.
	let max = 0;
	const stack: [unknown, number][] = [[value, 1]];
	while (stack.length) {
		const [v, d] = stack.pop()!;
		if (v === null || typeof v !== 'object') continue;
		if (d > max) max = d;
		if (max > limit) return max;
		for (const child of Array.isArray(v) ? v : Object.values(v)) stack.push([child, d + 1]);
	}
	return max;
}

function envelopesFrom(parsed: unknown): DecodeResult {
	if (depthOf(parsed, MAX_JSON_DEPTH) > MAX_JSON_DEPTH) {
		return { ok: false, reason: `JSON nested deeper than ${MAX_JSON_DEPTH} levels` };
	}
	const list = Array.isArray(parsed) ? parsed : [parsed];
	if (list.length === 0) return { ok: false, reason: 'empty list of envelopes' };
	if (list.length > MAX_ENVELOPES) {
		return {
			ok: false,
			reason: `${list.length} envelopes in one message (limit ${MAX_ENVELOPES})`
		};
	}
	const envelopes: CfxEnvelope[] = [];
	for (let i = 0; i < list.length; i++) {
		const where = list.length > 1 ? `envelope ${i + 1}: ` : '';
		const env = readEnvelope(list[i]);
		if (typeof env === 'string') return { ok: false, reason: where + env };
		envelopes.push(env);
	}
	return { ok: true, envelopes };
}

/** Case-insensitive own property of a plain object (CFX senders differ in case: `TransactionID`). */
export function prop(obj: unknown, ...names: string[]): unknown {
	if (obj === null || typeof obj !== 'object' || Array.isArray(obj)) return undefined;
	const record = obj as Record<string, unknown>;
	for (const name of names) {
		if (Object.prototype.hasOwnProperty.call(record, name)) return record[name];
	}
	const wanted = new Set(names.map((n) => n.toLowerCase()));
	for (const key of Object.keys(record)) if (wanted.has(key.toLowerCase())) return record[key];
	return undefined;
}

/** Longest text field kept (names, handles, identifiers). */
export const MAX_TEXT = 200;

/** A trimmed non-empty string of at most MAX_TEXT characters, or null. */
export function text(value: unknown): string | null {
	if (typeof value !== 'string' && typeof value !== 'number') return null;
	const s = String(value).trim();
	if (s === '' || s.length > MAX_TEXT) return null;
	// Control characters never belong in a handle, serial or designator.
	if (/[\u0000-\u001f\u007f]/.test(s)) return null;
	return s;
}

function readEnvelope(value: unknown): CfxEnvelope | string {
	if (value === null || typeof value !== 'object' || Array.isArray(value)) {
		return 'not a CFX envelope (expected a JSON object)';
	}
	const messageName = text(prop(value, 'MessageName'));
	if (!messageName) return 'envelope has no MessageName';
	const source = text(prop(value, 'Source'));
	if (!source) return `${messageName}: envelope has no Source (the sender's CFX handle)`;
	const stamp = prop(value, 'TimeStamp', 'Timestamp');
	const timeStampMs = typeof stamp === 'string' ? parseCfxTime(stamp) : null;
	if (timeStampMs === null)
		return `${messageName}: envelope TimeStamp missing or not an ISO 8601 time`;
	const body = prop(value, 'MessageBody');
	if (body === null || typeof body !== 'object' || Array.isArray(body)) {
		return `${messageName}: envelope has no MessageBody object`;
	}
	return {
		messageName,
		version: text(prop(value, 'Version')),
		timeStampMs,
		uniqueId: text(prop(value, 'UniqueID', 'UniqueId')),
		source,
		body: body as Record<string, unknown>
	};
}

const ISO_TIME =
	/^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2}):(\d{2})(?:\.(\d{1,9}))?(Z|[+-]\d{2}:\d{2})?$/;

/**
 * Epoch ms of a CFX time: ISO 8601 as .NET writes it (up to 7 fractional digits, with `Z` or an
 * offset; without either it is read as UTC). Null when not such a time.
 * @example parseCfxTime('2026-12-03T08:15:30.1234567+01:00') // 1796282130123
 */
export function parseCfxTime(value: string): number | null {
	const m = ISO_TIME.exec(value.trim());
	if (!m) return null;
	const [, y, mo, d, h, mi, s, frac, zone] = m;
	const ms = frac ? Number((frac + '00').slice(0, 3)) : 0;
	let t = Date.UTC(+y, +mo - 1, +d, +h, +mi, +s, ms);
	const check = new Date(t);
	if (
		check.getUTCMonth() !== +mo - 1 ||
		check.getUTCDate() !== +d ||
		+h > 23 ||
		+mi > 59 ||
		+s > 59
	) {
		return null;
	}
	if (zone && zone !== 'Z') {
		const sign = zone[0] === '-' ? -1 : 1;
		t -= sign * (Number(zone.slice(1, 3)) * 60 + Number(zone.slice(4, 6))) * 60_000;
	}
	return t;
}

const TIMESPAN = /^(?:(\d{1,5})\.)?(\d{1,2}):(\d{2}):(\d{2})(?:\.(\d{1,7}))?$/;

/**
 * Milliseconds of a .NET TimeSpan as CFX writes it (`[d.]hh:mm:ss[.fffffff]`), or null.
 * @example parseTimeSpanMs('00:00:38.5') // 38500
 */
export function parseTimeSpanMs(value: unknown): number | null {
	if (typeof value !== 'string') return null;
	const m = TIMESPAN.exec(value.trim());
	if (!m) return null;
	const [, days, h, mi, s, frac] = m;
	if (+h > 23 || +mi > 59 || +s > 59) return null;
	const ms = frac ? Number((frac + '00').slice(0, 3)) : 0;
	return (((Number(days ?? 0) * 24 + +h) * 60 + +mi) * 60 + +s) * 1000 + ms;
}
