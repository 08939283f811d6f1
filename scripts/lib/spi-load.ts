import { createWriteStream, statSync } from 'node:fs';
import { once } from 'node:events';
import { request as httpRequest } from 'node:http';
import Database from 'better-sqlite3';

/**
 * SPI load for a server of one's own (./own-server.ts): canonical files of any size, uploads over
 * a slow link, and row counts read from the database file as another process would.
 */

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result\n';

/**
 * Write a canonical SPI export (layout: README, SPI inspection data) of `boards` boards ×
 * `padsPerBoard` pads with invented serials; returns its size in bytes.
 */
export async function writeSpiFile(
	path: string,
	boards: number,
	padsPerBoard: number,
	serialPrefix: string
): Promise<number> {
	const out = createWriteStream(path);
	out.write(HEADER);
	const start = Date.parse('2026-04-01T06:00:00Z');
	for (let b = 0; b < boards; b++) {
		const serial = `${serialPrefix}-${String(b + 1).padStart(6, '0')}`;
		const prefix = `${serial},${new Date(start + b * 20_000).toISOString()},SMT-1,PB-100,0,`;
		let chunk = '';
		for (let p = 0; p < padsPerBoard; p++) {
			const vol = (96 + ((b * 7 + p * 13) % 1500) / 100).toFixed(2);
			const result = p % 997 === 0 ? 'fail' : 'pass';
			chunk += `${prefix}C${(p >> 1) + 1},${(p & 1) + 1},${vol},99.50,121.25,1.50,-2.00,${result}\n`;
		}
		if (!out.write(chunk)) await once(out, 'drain');
	}
	out.end();
	await once(out, 'finish');
	return statSync(path).size;
}

/**
 * POST a file to /api/spi/imports as text/csv, `pieceBytes` at a time with `pauseMs` between
 * pieces (an upload over a slow link); `onPiece` runs after each piece (it may wait). Resolves
 * with the status and JSON answer, or rejects when the connection breaks.
 */
export function uploadPaced(
	url: string,
	token: string,
	bytes: Buffer,
	fileName: string,
	options: { pieceBytes: number; pauseMs: number; onPiece?: (sent: number) => Promise<void> }
): { done: Promise<{ status: number; body: Record<string, unknown> }> } {
	const done = new Promise<{ status: number; body: Record<string, unknown> }>((resolve, reject) => {
		const req = httpRequest(
			`${url}/api/spi/imports?fileName=${encodeURIComponent(fileName)}`,
			{
				method: 'POST',
				headers: {
					authorization: `Bearer ${token}`,
					'content-type': 'text/csv',
					'content-length': String(bytes.length)
				}
			},
			(res) => {
				let text = '';
				res.setEncoding('utf8');
				res.on('data', (c) => (text += c));
				res.on('end', () => {
					try {
						resolve({ status: res.statusCode ?? 0, body: JSON.parse(text) });
					} catch {
						resolve({ status: res.statusCode ?? 0, body: { text } });
					}
				});
				res.on('error', reject);
			}
		);
		req.on('error', reject);
		(async () => {
			for (let sent = 0; sent < bytes.length;) {
				const piece = bytes.subarray(sent, sent + options.pieceBytes);
				sent += piece.length;
				if (!req.write(piece)) await once(req, 'drain');
				if (options.onPiece) await options.onPiece(sent);
				if (options.pauseMs > 0) await new Promise((r) => setTimeout(r, options.pauseMs));
			}
			req.end();
		})().catch(reject);
	});
	return { done };
}

/** Row counts straight from the database file (a reader of its own, as another process). */
export function spiCounts(databaseFile: string) {
	const db = new Database(databaseFile, { readonly: true });
	try {
		const n = (q: string) => db.prepare(q).pluck().get() as number;
		return {
			boards: n('select count(*) from spi_boards'),
			padDictionary: n('select count(*) from spi_pads'),
			/** Pad rows readers can reach (their board is stored). */
			visibleMeasurements: n(
				'select count(*) from spi_pad_measurements m join spi_boards b on b.id = m.board_id'
			),
			allMeasurements: n('select count(*) from spi_pad_measurements'),
			imported: n(`select count(*) from spi_imports where status = 'imported'`),
			importing: n(`select count(*) from spi_imports where status = 'importing'`)
		};
	} finally {
		db.close();
	}
}

export function integrityCheck(databaseFile: string): string {
	const db = new Database(databaseFile, { readonly: true });
	try {
		return db.pragma('integrity_check', { simple: true }) as string;
	} finally {
		db.close();
	}
}
