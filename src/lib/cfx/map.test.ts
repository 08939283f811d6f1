import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import {
	MAX_BODY_BYTES,
	MAX_ENVELOPES,
	MAX_INFLATED_BYTES,
	decodeAmqpBody,
	mapEnvelope,
	parseCfxTime,
	parseTimeSpanMs,
	spiCsvForUnits,
	type CfxEnvelope,
	type CfxRecord,
	type MapResult
} from './index';

// Messages written from the CFX SDK's published definitions (sources in reference/cfx/README.md).
const ref = (name: string) => readFileSync(`reference/cfx/${name}`, 'utf8');

function one(body: unknown, encoding?: string): CfxEnvelope {
	const decoded = decodeAmqpBody(body, encoding);
	if (!decoded.ok) throw new Error(decoded.reason);
	expect(decoded.envelopes).toHaveLength(1);
	return decoded.envelopes[0];
}

function record(result: MapResult): CfxRecord {
	if (result.status !== 'record') throw new Error(`${result.status}: ${result.reason}`);
	return result.record;
}

function quarantined(result: MapResult): string {
	if (result.status !== 'quarantine') throw new Error(`expected quarantine, got ${result.status}`);
	return result.reason;
}

describe('decodeAmqpBody', () => {
	it('reads a plain JSON envelope and its fields, time zone applied', () => {
		const env = one(Buffer.from(ref('work-started.json')));
		expect(env.messageName).toBe('CFX.Production.WorkStarted');
		expect(env.source).toBe('fenmoor.l1.printer');
		expect(env.uniqueId).toBe('6f1c2a0e-1d6b-4a0c-9d3e-0b7a0c2e1f01');
		// 08:15:30.1234567+01:00 (reference/cfx/README.md) = 07:15:30.123Z
		expect(new Date(env.timeStampMs).toISOString()).toBe('2026-12-03T07:15:30.123Z');
	});

	it('inflates gzip bodies, by content-encoding or by their magic bytes', () => {
		const zipped = gzipSync(Buffer.from(ref('units-inspected-spi.json')));
		expect(one(zipped, 'gzip').messageName).toBe('CFX.Production.TestAndInspection.UnitsInspected');
		expect(one(zipped).messageName).toBe('CFX.Production.TestAndInspection.UnitsInspected');
	});

	it('reads several envelopes from one message (a JSON array)', () => {
		const body = `[${ref('work-started.json')},${ref('units-processed-print.json')}]`;
		const decoded = decodeAmqpBody(Buffer.from(body));
		expect(decoded.ok && decoded.envelopes.map((e) => e.messageName)).toEqual([
			'CFX.Production.WorkStarted',
			'CFX.Production.Processing.UnitsProcessed'
		]);
	});

	it('takes an already decoded amqp-value object and a BOM-prefixed string', () => {
		expect(one(JSON.parse(ref('fault-occurred.json'))).messageName).toBe(
			'CFX.ResourcePerformance.FaultOccurred'
		);
		expect(one('\ufeff' + ref('fault-occurred.json')).source).toBe('fenmoor.l1.printer');
	});

	it('gives a reason, never a throw, for hostile bodies', () => {
		const reasons = [
			decodeAmqpBody(null),
			decodeAmqpBody(Buffer.alloc(0)),
			decodeAmqpBody(Buffer.from('not json')),
			decodeAmqpBody(Buffer.from([0xff, 0xfe, 0x00])),
			decodeAmqpBody(Buffer.from([0x1f, 0x8b, 1, 2, 3])),
			decodeAmqpBody(Buffer.from('{}'), 'br'),
			decodeAmqpBody(Buffer.alloc(MAX_BODY_BYTES + 1, 32)),
			decodeAmqpBody(gzipSync(Buffer.alloc(MAX_INFLATED_BYTES + 1024, 32))),
			decodeAmqpBody('['.repeat(100_000) + ']'.repeat(100_000)),
			decodeAmqpBody(JSON.stringify(Array.from({ length: MAX_ENVELOPES + 1 }, () => ({})))),
			decodeAmqpBody('[]'),
			decodeAmqpBody('42'),
			decodeAmqpBody('{"MessageName":"CFX.Production.WorkStarted","Source":"a","MessageBody":{}}'),
			decodeAmqpBody(
				'{"MessageName":"CFX.Production.WorkStarted","Source":"a","TimeStamp":"2026-02-30T00:00:00Z","MessageBody":{}}'
			),
			decodeAmqpBody('{"MessageName":"X","TimeStamp":"2026-01-01T00:00:00Z","MessageBody":{}}'),
			decodeAmqpBody(
				'{"MessageName":"X","Source":"a\\u0000b","TimeStamp":"2026-01-01T00:00:00Z","MessageBody":{}}'
			),
			decodeAmqpBody(
				'{"MessageName":"X","Source":"a","TimeStamp":"2026-01-01T00:00:00Z","MessageBody":[]}'
			)
		];
		const texts = reasons.map((r) => (r.ok ? 'ok' : r.reason));
		expect(texts).toEqual([
			'empty body',
			'empty body',
			expect.stringMatching(/^body is not JSON/),
			'body is not valid UTF-8',
			'gzip body could not be inflated (corrupt or truncated)',
			'unsupported content-encoding "br"',
			`body of ${MAX_BODY_BYTES + 1} bytes exceeds the ${MAX_BODY_BYTES}-byte limit`,
			`gzip body inflates beyond ${MAX_INFLATED_BYTES} bytes (limit)`,
			'JSON nested deeper than 32 levels',
			`${MAX_ENVELOPES + 1} envelopes in one message (limit ${MAX_ENVELOPES})`,
			'empty list of envelopes',
			'not a CFX envelope (expected a JSON object)',
			'CFX.Production.WorkStarted: envelope TimeStamp missing or not an ISO 8601 time',
			'CFX.Production.WorkStarted: envelope TimeStamp missing or not an ISO 8601 time',
			"X: envelope has no Source (the sender's CFX handle)",
			"X: envelope has no Source (the sender's CFX handle)",
			'X: envelope has no MessageBody object'
		]);
	});
});

describe('CFX times', () => {
	it('reads .NET ISO times and TimeSpans', () => {
		expect(parseCfxTime('2026-12-03T07:16:40Z')).toBe(Date.UTC(2026, 11, 3, 7, 16, 40));
		expect(parseCfxTime('2026-12-03T07:16:40')).toBe(Date.UTC(2026, 11, 3, 7, 16, 40));
		expect(parseCfxTime('2026-12-03T02:16:40.5-05:00')).toBe(Date.UTC(2026, 11, 3, 7, 16, 40, 500));
		expect(parseCfxTime('yesterday')).toBeNull();
		expect(parseTimeSpanMs('00:00:22.5000000')).toBe(22_500);
		expect(parseTimeSpanMs('1.02:00:00')).toBe(26 * 3_600_000);
		expect(parseTimeSpanMs('00:61:00')).toBeNull();
		expect(parseTimeSpanMs(38)).toBeNull();
	});
});

describe('mapEnvelope', () => {
	it('WorkStarted: transaction (TransactionID) and units (PositionNumber)', () => {
		const r = record(mapEnvelope(one(ref('work-started.json'))));
		expect(r).toMatchObject({
			kind: 'work-started',
			handle: 'fenmoor.l1.printer',
			transactionId: '2c24590d-39c5-4039-96a5-91900cecedfa',
			lane: '1',
			units: [
				{ unitIdentifier: 'FW-PNL-000101', positionNumber: 1 },
				{ unitIdentifier: 'FW-PNL-000101', positionNumber: 2 }
			]
		});
	});

	it('UnitsProcessed with solder-paste printing data → recipe-keyed print parameters', () => {
		const r = record(mapEnvelope(one(ref('units-processed-print.json'))));
		if (r.kind !== 'units-processed') throw new Error(r.kind);
		expect(r.transactionId).toBe('2c24590d-39c5-4039-96a5-91900cecedfa'); // TransactionId spelling
		expect(r.recipeName).toBe('FW-CTRL-200');
		expect(r.units).toHaveLength(1);
		expect(r.units[0]).toMatchObject({
			unitIdentifier: 'FW-PNL-000101',
			positionNumber: 1, // UnitPositionNumber spelling
			parameters: {
				squeegeePressureKg: 6.5,
				squeegeeSpeedMmS: 45,
				separationSpeedMmS: 1.5,
				separationDistanceMm: 2,
				printStroke: 'back-to-front'
			},
			printOffsets: { xMm: 0.01, yMm: -0.02, thetaDeg: 0 },
			cycleTimeMs: 22_500
		});
	});

	it('UnitsProcessed from an older sender (no $type) with common process data', () => {
		const env = JSON.parse(ref('units-processed-print.json'));
		const data = env.MessageBody.UnitProcessData[0].UnitProcessData;
		delete data.$type;
		delete env.MessageBody.$type;
		env.MessageBody.CommonProcessData = data;
		env.MessageBody.UnitProcessData[0].UnitProcessData = null;
		const r = record(mapEnvelope(one(env)));
		expect(r.kind === 'units-processed' && r.units[0].parameters.squeegeeSpeedMmS).toBe(45);
		expect(r.kind === 'units-processed' && r.recipeName).toBe('FW-CTRL-200');
	});

	it('UnitsInspected: both places read, each deposit once, units converted (reference/cfx)', () => {
		const r = record(mapEnvelope(one(gzipSync(Buffer.from(ref('units-inspected-spi.json'))))));
		if (r.kind !== 'units-inspected') throw new Error(r.kind);
		expect(r.units).toHaveLength(1);
		const unit = r.units[0];
		expect(unit.result).toBe('fail'); // OverallResult "Failed"
		const rows = Object.fromEntries(unit.pads.map((p) => [`${p.refdes}.${p.pad}`, p]));
		expect(Object.keys(rows).sort()).toEqual(['R1.1', 'R1.2', 'U3.7']);
		// Hand-computed values of reference/cfx/README.md (volume in millilitres → %, µm³).
		expect(rows['R1.1'].volumePct).toBeCloseTo(96, 9);
		expect(rows['R1.1'].areaPct).toBeCloseTo(104, 9);
		expect(rows['R1.1'].heightUm).toBeCloseTo(118, 9);
		expect(rows['R1.1'].offsetXUm).toBeCloseTo(12, 9);
		expect(rows['R1.1'].offsetYUm).toBeCloseTo(-8, 9);
		expect(rows['R1.1'].volumeUm3).toBe(7_200_000);
		expect(rows['R1.2'].volumePct).toBeCloseTo(100, 9);
		expect(rows['R1.2'].areaPct).toBeCloseTo(96, 9);
		expect(rows['R1.2'].volumeUm3).toBe(7_500_000);
		expect(rows['U3.7']).toMatchObject({ result: 'fail', volumeUm3: 3_600_000 });
		expect(rows['U3.7'].volumePct).toBeCloseTo(48, 9);
		expect(rows['U3.7'].areaPct).toBeCloseTo(80, 9);
		expect(rows['U3.7'].heightUm).toBeCloseTo(72, 9);
		expect(rows['U3.7'].offsetXUm).toBeCloseTo(-30, 9);
	});

	it('StencilCleaned and FaultOccurred', () => {
		expect(record(mapEnvelope(one(ref('stencil-cleaned.json'))))).toMatchObject({
			kind: 'stencil-cleaned',
			toolName: 'ST-CTRL-200-A',
			mode: 'V',
			cyclesSinceLastClean: 35,
			durationMs: 38_000
		});
		expect(record(mapEnvelope(one(ref('fault-occurred.json'))))).toMatchObject({
			kind: 'fault-occurred',
			code: 'ERR-PASTE-LOW',
			severity: 'Error',
			faultId: 'a2e4c7f0-0b1c-4d2e-8f3a-5b6c7d8e9f10'
		});
	});

	it('stencil and squeegee changes, fault cleared, station state', () => {
		const env = (messageName: string, body: object) =>
			one({
				MessageName: messageName,
				Source: 'h',
				TimeStamp: '2026-12-03T07:00:00Z',
				MessageBody: body
			});
		expect(
			record(
				mapEnvelope(
					env('CFX.ResourcePerformance.SolderPastePrinting.StencilChanged', {
						OldStencil: { Name: 'ST-A' },
						NewStencil: { Name: 'ST-B' }
					})
				)
			)
		).toMatchObject({ kind: 'stencil-changed', oldName: 'ST-A', newName: 'ST-B' });
		expect(
			record(
				mapEnvelope(
					env('CFX.ResourcePerformance.SolderPastePrinting.SqueegeeChanged', {
						NewSqueegee: { UniqueIdentifier: 'SQ-9' }
					})
				)
			)
		).toMatchObject({ kind: 'squeegee-changed', oldName: null, newName: 'SQ-9' });
		expect(
			record(mapEnvelope(env('CFX.ResourcePerformance.FaultCleared', { FaultOccurrenceId: 'f1' })))
		).toMatchObject({ kind: 'fault-cleared', faultId: 'f1' });
		expect(
			record(
				mapEnvelope(
					env('CFX.ResourcePerformance.StationStateChanged', {
						OldState: 'UnscheduledDowntime',
						NewState: 'ReadyProcessingExecuting',
						OldStateDuration: '00:05:00'
					})
				)
			)
		).toMatchObject({ kind: 'station-state-changed', oldStateDurationMs: 300_000 });
		expect(mapEnvelope(env('CFX.Heartbeat', {})).status).toBe('ignored');
	});

	it('quarantines what it cannot map, with a reason naming the field', () => {
		const env = (messageName: string, body: object) =>
			one({
				MessageName: messageName,
				Source: 'h',
				TimeStamp: '2026-12-03T07:00:00Z',
				MessageBody: body
			});
		const inspected = JSON.parse(ref('units-inspected-spi.json')).MessageBody;
		const strVol = structuredClone(inspected);
		strVol.InspectedUnits[0].Inspections[0].Measurements[0].Vol = '7.2e-6';
		const zeroNominal = structuredClone(inspected);
		zeroNominal.InspectedUnits[0].Inspections[0].Measurements[1].EVol = 0;
		const badResult = structuredClone(inspected);
		badResult.InspectedUnits[0].Inspections[0].Measurements[0].Result = 'Maybe';
		const aoiOnly = structuredClone(inspected);
		aoiOnly.InspectedUnits[0].Inspections = [];
		expect([
			quarantined(mapEnvelope(env('CFX.Production.WorkStarted', { Units: [] }))),
			quarantined(
				mapEnvelope(
					env('CFX.Production.WorkStarted', { TransactionID: 't', Units: [{ PositionNumber: 1 }] })
				)
			),
			quarantined(
				mapEnvelope(
					env('CFX.Production.UnitsArrived', {
						Units: [{ UnitIdentifier: 'A', PositionNumber: 1.5 }]
					})
				)
			),
			quarantined(mapEnvelope(env('CFX.Production.TestAndInspection.UnitsInspected', strVol))),
			quarantined(mapEnvelope(env('CFX.Production.TestAndInspection.UnitsInspected', zeroNominal))),
			quarantined(mapEnvelope(env('CFX.Production.TestAndInspection.UnitsInspected', badResult))),
			quarantined(mapEnvelope(env('CFX.Production.TestAndInspection.UnitsInspected', aoiOnly))),
			quarantined(
				mapEnvelope(
					env('CFX.Production.Processing.UnitsProcessed', {
						UnitProcessData: [{ UnitIdentifier: 'A', UnitProcessData: { ConveyorSpeed: 1 } }]
					})
				)
			),
			quarantined(mapEnvelope(env('CFX.Production.Teleported', {})))
		]).toEqual([
			'CFX.Production.WorkStarted: TransactionID missing',
			'CFX.Production.WorkStarted: Units[0]: UnitIdentifier missing or not text',
			'CFX.Production.UnitsArrived: Units[0]: PositionNumber must be a whole number 0–65535',
			'CFX.Production.TestAndInspection.UnitsInspected: InspectedUnits[0].Inspections[0].Measurements[0] (R1.1): Vol and EVol must be numbers',
			'CFX.Production.TestAndInspection.UnitsInspected: InspectedUnits[0].Inspections[0].Measurements[1] (R1.2): EVol must be above 0',
			'CFX.Production.TestAndInspection.UnitsInspected: InspectedUnits[0].Inspections[0].Measurements[0] (R1.1): Result "Maybe" is not Passed/Failed',
			'CFX.Production.TestAndInspection.UnitsInspected: no solder-paste measurements (SolderPasteMeasurement) in any unit',
			'CFX.Production.Processing.UnitsProcessed: UnitProcessData[0] carries no solder-paste printing process data',
			'unknown message CFX.Production.Teleported'
		]);
	});
});

describe('spiCsvForUnits', () => {
	it('writes the canonical layout: quoted text, 2-decimal numbers, whole µm³, print run ref', () => {
		const r = record(mapEnvelope(one(ref('units-inspected-spi.json'))));
		if (r.kind !== 'units-inspected') throw new Error(r.kind);
		const csv = spiCsvForUnits(r.units, {
			inspectedAtMs: r.atMs,
			lineCode: 'L1',
			productCode: 'FW-CTRL-200',
			stencilName: 'ST-"A"',
			printRunId: 17
		});
		const lines = csv.trimEnd().split('\r\n');
		expect(lines[0]).toBe(
			'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result,volume_um3,stencil,print_run'
		);
		expect(lines).toHaveLength(4);
		expect(lines[1]).toBe(
			'"FW-PNL-000101",2026-12-03T07:16:40.000Z,"L1","FW-CTRL-200",1,"R1","1",96.00,104.00,118.00,12.00,-8.00,pass,7200000,"ST-""A""",#17'
		);
		expect(lines[3]).toContain('"U3","7",48.00,80.00,72.00,-30.00,0.00,fail,3600000');
	});
});
