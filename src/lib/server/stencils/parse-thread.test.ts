import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { withLimits } from '$lib/stencil/limits';
import { parseApertureUpload, type UploadInput } from './upload';
import { parseApertureUploadOffThread } from './parse-thread';
import * as thread from './parse-thread';

const fixture = (name: string) => readFileSync(`tests/fixtures/stencil/${name}`, 'utf8');
const input = (fileName: string, text: string, extra: Partial<UploadInput> = {}): UploadInput => ({
	fileName,
	text,
	byteLength: Buffer.byteLength(text),
	...extra
});

// Starting a thread under tsx loads the TypeScript sources: seconds on this machine.
describe('parseApertureUploadOffThread', { timeout: 60_000 }, () => {
	it('gives the same answer as the parse in this thread, on a parser thread', async () => {
		const csv = input('apertures.csv', fixture('apertures.csv'), { unit: 'mm' });
		const limits = withLimits();
		const off = await parseApertureUploadOffThread(csv, limits);
		expect(thread.lastParseThreaded).toBe(true);
		expect(off).toEqual(parseApertureUpload(csv, limits));
		expect(off.ok).toBe(true);
	});

	it('a step-and-repeat asking for 100,000,000 copies is refused (413) before any copy is made', async () => {
		const text =
			'%FSLAX26Y26*%\n%MOMM*%\n%SRX10000Y10000I1J1*%\n%ADD10C,0.1*%\nD10*\nX0Y0D03*\n%SR*%\nM02*\n';
		const r = await parseApertureUploadOffThread(input('sr.gbr', text), withLimits());
		expect(r).toMatchObject({ ok: false, status: 413 });
		if (r.ok) return;
		expect(r.errors[0]).toMatchObject({ file: 'sr.gbr', line: 3 });
		expect(r.errors[0].message).toBe(
			'line 3, %SR: step-and-repeat asks for 100,000,000 copies; the limit is 50,000 openings per layer'
		);
	});

	it('a parse past its deadline ends its thread and is answered 413; the next parse works', async () => {
		const rows = Array.from({ length: 40_000 }, (_, i) => `U${i},1,rectangle,1,0.2,,,${i},5,0,`);
		const csv = input(
			'big.csv',
			`refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices\n${rows.join('\n')}\n`,
			{ unit: 'mm' }
		);
		const r = await parseApertureUploadOffThread(csv, withLimits({ parseDeadlineMs: 1 }));
		expect(r).toMatchObject({ ok: false, status: 413 });
		if (!r.ok)
			expect(r.error).toBe(
				'big.csv could not be read: reading it took longer than the 1 ms limit; nothing was imported.'
			);
		const again = await parseApertureUploadOffThread(
			input('apertures.csv', fixture('apertures.csv'), { unit: 'mm' }),
			withLimits()
		);
		expect(again.ok).toBe(true);
	});

	it('a parse that runs out of its heap ceiling ends its thread with 413, not the process', async () => {
		// 900 polygons of 1,000 vertices (17 MB of text): more objects than a 40 MB heap holds.
		const vertices = Array.from({ length: 1000 }, (_, k) => {
			const a = (2 * Math.PI * k) / 1000;
			return `${Math.cos(a).toFixed(6)} ${Math.sin(a).toFixed(6)}`;
		}).join(';');
		const rows = Array.from(
			{ length: 900 },
			(_, i) => `P${i},1,polygon,,,,,${i * 3},0,0,${vertices}`
		);
		const csv = input(
			'heavy.csv',
			`refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices\n${rows.join('\n')}\n`,
			{ unit: 'mm' }
		);
		const r = await parseApertureUploadOffThread(
			csv,
			withLimits({ parseHeapMb: 40, maxVerticesPerImport: 10_000_000 })
		);
		expect(r).toMatchObject({ ok: false, status: 413 });
		if (!r.ok) expect(r.error).toMatch(/more than the 40 MB of memory/);
	});
});
