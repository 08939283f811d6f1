/**
 * IPC-CFX messages → Rollbead records (pure). Message and field names follow the CFX SDK's
 * published definitions (IPC-2591; repository IPCConnectedFactoryExchange/CFX, release 2.1 /
 * SDK 2.1.1; the files read are listed in reference/cfx/README.md). Spellings that differ between
 * messages are all read (`TransactionID`/`TransactionId`, `PositionNumber`/`UnitPositionNumber`,
 * `Pass`/`Passed`); a body without `"$type"` (older senders) is recognised by the envelope's
 * `MessageName` alone.
 */
import { parseTimeSpanMs, prop, text, type CfxEnvelope } from './decode';

/** The CFX message names Rollbead maps (exact names from the standard). */
export const CFX_MESSAGES = {
	workStarted: 'CFX.Production.WorkStarted',
	workCompleted: 'CFX.Production.WorkCompleted',
	unitsArrived: 'CFX.Production.UnitsArrived',
	unitsDeparted: 'CFX.Production.UnitsDeparted',
	unitsProcessed: 'CFX.Production.Processing.UnitsProcessed',
	unitsInspected: 'CFX.Production.TestAndInspection.UnitsInspected',
	stencilChanged: 'CFX.ResourcePerformance.SolderPastePrinting.StencilChanged',
	stencilCleaned: 'CFX.ResourcePerformance.SolderPastePrinting.StencilCleaned',
	squeegeeChanged: 'CFX.ResourcePerformance.SolderPastePrinting.SqueegeeChanged',
	squeegeeCleaned: 'CFX.ResourcePerformance.SolderPastePrinting.SqueegeeCleaned',
	toolChanged: 'CFX.ResourcePerformance.ToolChanged',
	faultOccurred: 'CFX.ResourcePerformance.FaultOccurred',
	printerFaultOccurred: 'CFX.ResourcePerformance.SolderPastePrinting.FaultOccurred',
	faultCleared: 'CFX.ResourcePerformance.FaultCleared',
	stationStateChanged: 'CFX.ResourcePerformance.StationStateChanged'
} as const;

/** Messages a line may send that Rollbead does not need: settled and counted, nothing stored. */
export const CFX_IGNORED = new Set([
	'CFX.EndpointConnected',
	'CFX.EndpointShuttingDown',
	'CFX.Heartbeat',
	'CFX.ResourcePerformance.StationOnline',
	'CFX.ResourcePerformance.StationOffline',
	'CFX.ResourcePerformance.FaultAcknowledged',
	'CFX.ResourcePerformance.LogEntryRecorded',
	'CFX.Production.RecipeActivated',
	'CFX.Production.OperatorActivated',
	'CFX.Production.OperatorDeactivated'
]);

/** Most units in one message and most measurements per inspected unit (work is counted first). */
export const MAX_UNITS_PER_MESSAGE = 1_000;
export const MAX_MEASUREMENTS_PER_MESSAGE = 200_000;

export interface CfxUnit {
	unitIdentifier: string;
	/** `PositionNumber` (WorkStarted, arrivals) or `UnitPositionNumber` (processed, inspected). */
	positionNumber: number;
}

/** Print parameters read from SolderPastePrintingPCBProcessData, keyed like Rollbead recipes. */
export interface PrintParameters {
	squeegeePressureKg?: number;
	squeegeeSpeedMmS?: number;
	separationSpeedMmS?: number;
	separationDistanceMm?: number;
	printStroke?: 'front-to-back' | 'back-to-front';
}

export interface ProcessedUnit extends CfxUnit {
	result: string | null;
	parameters: PrintParameters;
	/** Printer's offsets and direction as sent (kept with the board, not windowed). */
	printOffsets: { xMm: number | null; yMm: number | null; thetaDeg: number | null };
	firstPrintDirection: string | null;
	recipeName: string | null;
	cycleTimeMs: number | null;
}

/** One solder-paste deposit in Rollbead's canonical units. */
export interface PadMeasurement {
	refdes: string;
	pad: string;
	volumePct: number;
	areaPct: number;
	heightUm: number;
	offsetXUm: number;
	offsetYUm: number;
	/** Whole µm³ (Vol in millilitres × 10¹²), null when the sender gives none. */
	volumeUm3: number | null;
	result: 'pass' | 'warn' | 'fail';
}

export interface InspectedUnit extends CfxUnit {
	result: 'pass' | 'fail' | null;
	pads: PadMeasurement[];
}

/** A mapped message: what the server stores. `atMs` is the envelope's TimeStamp. */
export type CfxRecord = { handle: string; atMs: number; messageName: string } & (
	| { kind: 'work-started'; transactionId: string; lane: string | null; units: CfxUnit[] }
	| { kind: 'work-completed'; transactionId: string; result: string | null; units: CfxUnit[] }
	| { kind: 'units-arrived' | 'units-departed'; units: CfxUnit[] }
	| {
			kind: 'units-processed';
			transactionId: string | null;
			recipeName: string | null;
			units: ProcessedUnit[];
	  }
	| {
			kind: 'units-inspected';
			transactionId: string | null;
			recipeName: string | null;
			units: InspectedUnit[];
	  }
	| {
			kind: 'stencil-changed' | 'squeegee-changed';
			oldName: string | null;
			newName: string | null;
	  }
	| {
			kind: 'stencil-cleaned' | 'squeegee-cleaned';
			toolName: string | null;
			mode: string | null;
			cyclesSinceLastClean: number | null;
			durationMs: number | null;
	  }
	| { kind: 'tool-changed'; oldName: string | null; newName: string | null }
	| {
			kind: 'fault-occurred';
			faultId: string | null;
			code: string | null;
			cause: string | null;
			severity: string | null;
			description: string | null;
	  }
	| { kind: 'fault-cleared'; faultId: string | null }
	| {
			kind: 'station-state-changed';
			oldState: string | null;
			newState: string | null;
			oldStateDurationMs: number | null;
	  }
);

export type MapResult =
	| { status: 'record'; record: CfxRecord }
	| { status: 'ignored'; reason: string }
	| { status: 'quarantine'; reason: string };

const q = (reason: string): MapResult => ({ status: 'quarantine', reason });

/** A finite JSON number (strings are not numbers: a sender that quotes them is refused). */
function num(value: unknown): number | null {
	return typeof value === 'number' && Number.isFinite(value) ? value : null;
}

function list(value: unknown): unknown[] {
	return Array.isArray(value) ? value : [];
}

/** The name without an SDK assembly suffix, for `$type` (`CFX.X.Y, CFX` → `CFX.X.Y`). */
function typeName(value: unknown): string | null {
	const t = text(prop(value, '$type'));
	return t ? t.split(',')[0].trim() : null;
}

function units(value: unknown, where: string): CfxUnit[] | string {
	const items = list(value);
	if (items.length > MAX_UNITS_PER_MESSAGE)
		return `${where}: ${items.length} units (limit ${MAX_UNITS_PER_MESSAGE})`;
	const out: CfxUnit[] = [];
	for (let i = 0; i < items.length; i++) {
		const unitIdentifier = text(prop(items[i], 'UnitIdentifier'));
		if (!unitIdentifier) return `${where}[${i}]: UnitIdentifier missing or not text`;
		const position = prop(items[i], 'PositionNumber', 'UnitPositionNumber');
		const positionNumber = position === undefined || position === null ? 1 : num(position);
		if (
			positionNumber === null ||
			!Number.isInteger(positionNumber) ||
			positionNumber < 0 ||
			positionNumber > 65535
		) {
			return `${where}[${i}]: PositionNumber must be a whole number 0–65535`;
		}
		out.push({ unitIdentifier, positionNumber });
	}
	return out;
}

function transactionId(body: Record<string, unknown>): string | null {
	return text(prop(body, 'TransactionID', 'TransactionId'));
}

/**
 * Map one envelope. Never throws: a message Rollbead cannot read is `quarantine` with a reason a
 * person can act on; a message Rollbead does not need is `ignored`.
 */
export function mapEnvelope(env: CfxEnvelope): MapResult {
	try {
		return mapNow(env);
	} catch (err) {
		// Belt and braces: a mapping fault quarantines the message rather than failing the link.
		return q(
			`${env.messageName}: could not be mapped (${String((err as Error)?.message ?? err).slice(0, 120)})`
		);
	}
}

function mapNow(env: CfxEnvelope): MapResult {
	// The envelope's MessageName decides: a body `$type` is optional (older senders omit it).
	const name = env.messageName;
	const base = { handle: env.source, atMs: env.timeStampMs, messageName: name };
	const b = env.body;
	switch (name) {
		case CFX_MESSAGES.workStarted:
		case CFX_MESSAGES.workCompleted: {
			const id = transactionId(b);
			if (!id) return q(`${name}: TransactionID missing`);
			const u = units(prop(b, 'Units'), 'Units');
			if (typeof u === 'string') return q(`${name}: ${u}`);
			if (name === CFX_MESSAGES.workStarted) {
				return {
					status: 'record',
					record: {
						...base,
						kind: 'work-started',
						transactionId: id,
						lane: text(prop(b, 'Lane')),
						units: u
					}
				};
			}
			return {
				status: 'record',
				record: {
					...base,
					kind: 'work-completed',
					transactionId: id,
					result: text(prop(b, 'Result')),
					units: u
				}
			};
		}
		case CFX_MESSAGES.unitsArrived:
		case CFX_MESSAGES.unitsDeparted: {
			const u = units(prop(b, 'Units'), 'Units');
			if (typeof u === 'string') return q(`${name}: ${u}`);
			if (u.length === 0) return q(`${name}: no Units`);
			const kind = name === CFX_MESSAGES.unitsArrived ? 'units-arrived' : 'units-departed';
			return { status: 'record', record: { ...base, kind, units: u } };
		}
		case CFX_MESSAGES.unitsProcessed:
			return mapProcessed(base, b);
		case CFX_MESSAGES.unitsInspected:
			return mapInspected(base, b);
		case CFX_MESSAGES.stencilChanged:
		case CFX_MESSAGES.squeegeeChanged: {
			const stencil = name === CFX_MESSAGES.stencilChanged;
			const oldTool = prop(b, stencil ? 'OldStencil' : 'OldSqueegee');
			const newTool = prop(b, stencil ? 'NewStencil' : 'NewSqueegee');
			const newName = toolName(newTool);
			if (!newName && !toolName(oldTool))
				return q(`${name}: neither the old nor the new tool is named`);
			return {
				status: 'record',
				record: {
					...base,
					kind: stencil ? 'stencil-changed' : 'squeegee-changed',
					oldName: toolName(oldTool),
					newName
				}
			};
		}
		case CFX_MESSAGES.stencilCleaned:
		case CFX_MESSAGES.squeegeeCleaned: {
			const stencil = name === CFX_MESSAGES.stencilCleaned;
			const tool = prop(b, stencil ? 'Stencil' : 'Squeegee');
			return {
				status: 'record',
				record: {
					...base,
					kind: stencil ? 'stencil-cleaned' : 'squeegee-cleaned',
					toolName: toolName(tool),
					mode: text(prop(b, stencil ? 'StencilCleanMode' : 'SqueegeeCleanType')),
					cyclesSinceLastClean: wholeOrNull(prop(b, 'CyclesSinceLastClean')),
					durationMs: parseTimeSpanMs(prop(b, stencil ? 'StencilCleanTime' : 'SqueegeeCleanTime'))
				}
			};
		}
		case CFX_MESSAGES.toolChanged: {
			return {
				status: 'record',
				record: {
					...base,
					kind: 'tool-changed',
					oldName: toolName(prop(b, 'OldTool')),
					newName: toolName(prop(b, 'NewTool'))
				}
			};
		}
		case CFX_MESSAGES.faultOccurred:
		case CFX_MESSAGES.printerFaultOccurred: {
			const fault = prop(b, 'Fault');
			if (fault === null || typeof fault !== 'object') return q(`${name}: no Fault`);
			return {
				status: 'record',
				record: {
					...base,
					messageName: name,
					kind: 'fault-occurred',
					faultId: text(prop(fault, 'FaultOccurrenceId')),
					code: text(prop(fault, 'FaultCode')),
					cause: text(prop(fault, 'Cause')),
					severity: text(prop(fault, 'Severity')),
					description: text(prop(fault, 'Description'))
				}
			};
		}
		case CFX_MESSAGES.faultCleared:
			return {
				status: 'record',
				record: { ...base, kind: 'fault-cleared', faultId: text(prop(b, 'FaultOccurrenceId')) }
			};
		case CFX_MESSAGES.stationStateChanged:
			return {
				status: 'record',
				record: {
					...base,
					kind: 'station-state-changed',
					oldState: text(prop(b, 'OldState')),
					newState: text(prop(b, 'NewState')),
					oldStateDurationMs: parseTimeSpanMs(prop(b, 'OldStateDuration'))
				}
			};
	}
	if (CFX_IGNORED.has(name))
		return { status: 'ignored', reason: `${name} is not used by Rollbead` };
	return q(`unknown message ${name}`);
}

function toolName(tool: unknown): string | null {
	return text(prop(tool, 'Name')) ?? text(prop(tool, 'UniqueIdentifier'));
}

function wholeOrNull(value: unknown): number | null {
	const n = num(value);
	return n !== null && Number.isInteger(n) && n >= 0 ? n : null;
}

/** Direction words CFX senders use (the SDK's enum is `forward`/`backward`), → Rollbead's stroke. */
function stroke(value: string | null): 'front-to-back' | 'back-to-front' | undefined {
	if (!value) return undefined;
	const v = value.toLowerCase().replace(/[^a-z]/g, '');
	if (v === 'forward' || v === 'fronttoback' || v === 'frontback') return 'front-to-back';
	if (v === 'backward' || v === 'backtofront' || v === 'backfront') return 'back-to-front';
	return undefined;
}

/**
 * Printer process data → recipe keys. The SDK names the values but not their units; Rollbead
 * reads PrintPressure as kg (the unit printers display and recipes window), PrintSpeed and
 * SeparationSpeed as mm/s, SeparationDistance as mm (reference/cfx/README.md). Several strokes:
 * the first stroke's values (the recipe windows one stroke).
 */
function printParameters(data: unknown): { parameters: PrintParameters; reason: string | null } {
	const parameters: PrintParameters = {};
	const strokes = list(prop(data, 'Strokes'));
	const first = strokes[0];
	const pressure = num(prop(first, 'PrintPressure'));
	const speed = num(prop(first, 'PrintSpeed'));
	if (pressure !== null) parameters.squeegeePressureKg = pressure;
	if (speed !== null) parameters.squeegeeSpeedMmS = speed;
	const separation = prop(data, 'Separation');
	const sepSpeed = num(prop(separation, 'SeparationSpeed'));
	const sepDistance = num(prop(separation, 'SeparationDistance'));
	if (sepSpeed !== null) parameters.separationSpeedMmS = sepSpeed;
	if (sepDistance !== null) parameters.separationDistanceMm = sepDistance;
	const direction = stroke(
		text(prop(data, 'FirstPrintDirection')) ?? text(prop(separation, 'SqueegeeDirection'))
	);
	if (direction) parameters.printStroke = direction;
	for (const [key, value] of Object.entries(parameters)) {
		if (typeof value === 'number' && value < 0)
			return { parameters, reason: `${key} is negative (${value})` };
	}
	return { parameters, reason: null };
}

const PRINT_DATA_TYPE = 'CFX.Structures.SolderPastePrinting.SolderPastePrintingPCBProcessData';

function isPrintData(data: unknown): boolean {
	if (data === null || typeof data !== 'object') return false;
	const t = typeName(data);
	if (t) return t === PRINT_DATA_TYPE;
	// Older senders omit "$type": recognise the structure by its fields.
	return prop(data, 'Strokes') !== undefined || prop(data, 'Separation') !== undefined;
}

function mapProcessed(
	base: { handle: string; atMs: number; messageName: string },
	b: Record<string, unknown>
): MapResult {
	const name = base.messageName;
	const common = prop(b, 'CommonProcessData');
	const entries = list(prop(b, 'UnitProcessData'));
	if (entries.length > MAX_UNITS_PER_MESSAGE)
		return q(`${name}: ${entries.length} units (limit ${MAX_UNITS_PER_MESSAGE})`);
	const out: ProcessedUnit[] = [];
	let recipeName: string | null = isPrintData(common) ? text(prop(common, 'RecipeName')) : null;
	for (let i = 0; i < entries.length; i++) {
		const e = entries[i];
		const unitIdentifier = text(prop(e, 'UnitIdentifier'));
		if (!unitIdentifier) return q(`${name}: UnitProcessData[${i}].UnitIdentifier missing`);
		const pos = prop(e, 'UnitPositionNumber', 'PositionNumber');
		const positionNumber = pos === undefined || pos === null ? 1 : num(pos);
		if (
			positionNumber === null ||
			!Number.isInteger(positionNumber) ||
			positionNumber < 0 ||
			positionNumber > 65535
		) {
			return q(`${name}: UnitProcessData[${i}].UnitPositionNumber must be a whole number 0–65535`);
		}
		const own = prop(e, 'UnitProcessData');
		const data = isPrintData(own) ? own : isPrintData(common) ? common : null;
		if (!data)
			return q(`${name}: UnitProcessData[${i}] carries no solder-paste printing process data`);
		const { parameters, reason } = printParameters(data);
		if (reason) return q(`${name}: UnitProcessData[${i}]: ${reason}`);
		const unitRecipe = text(prop(data, 'RecipeName'));
		recipeName ??= unitRecipe;
		out.push({
			unitIdentifier,
			positionNumber,
			result: text(prop(e, 'UnitResult')),
			parameters,
			printOffsets: {
				xMm: num(prop(data, 'OffsetX')),
				yMm: num(prop(data, 'OffsetY')),
				thetaDeg: num(prop(data, 'OffsetTheta'))
			},
			firstPrintDirection: text(prop(data, 'FirstPrintDirection')),
			recipeName: unitRecipe,
			cycleTimeMs: parseTimeSpanMs(prop(data, 'CycleTime'))
		});
	}
	if (out.length === 0) return q(`${name}: no UnitProcessData`);
	return {
		status: 'record',
		record: {
			...base,
			kind: 'units-processed',
			transactionId: transactionId(b),
			recipeName,
			units: out
		}
	};
}

const SPM_TYPE = 'CFX.Structures.SolderPasteInspection.SolderPasteMeasurement';

function isPasteMeasurement(m: unknown): boolean {
	const t = typeName(m);
	if (t) return t === SPM_TYPE;
	// Without "$type": a deposit has a volume and its nominal.
	return prop(m, 'Vol') !== undefined && prop(m, 'EVol') !== undefined;
}

/** `Pass`/`Passed`/`Fail`/`Failed` (units use one spelling, tests the other) → Rollbead words. */
function verdict(value: unknown): 'pass' | 'warn' | 'fail' | null {
	const v = text(value)?.toLowerCase();
	if (v === 'pass' || v === 'passed') return 'pass';
	if (v === 'fail' || v === 'failed') return 'fail';
	if (v === 'warning' || v === 'warn' || v === 'passedwithwarning') return 'warn';
	return null;
}

/**
 * The deposit's pad: `MeasurementName` (the SDK example names each deposit there, "R1.1", "R1.2",
 * while `CRDs` may name only the component), else `CRDs`.
 */
function padName(m: unknown): string | null {
	return text(prop(m, 'MeasurementName')) ?? text(prop(m, 'CRDs'));
}

/** `R1.1` → refdes `R1`, pad `1`; a designator without a lead number is the component's one pad. */
function splitDesignator(name: string): { refdes: string; pad: string } {
	const dot = name.lastIndexOf('.');
	if (dot > 0 && dot < name.length - 1)
		return { refdes: name.slice(0, dot), pad: name.slice(dot + 1) };
	return { refdes: name, pad: '1' };
}

/** 1 mL = 1 cm³ = 10¹² µm³. */
export const UM3_PER_ML = 1e12;
/** 1 mm = 1000 µm. */
export const UM_PER_MM = 1000;

/**
 * One SolderPasteMeasurement → canonical units: volume % = Vol / EVol × 100 (both mL); area % =
 * A / EA × 100 (since CFX 1.3), else X·Y / (EX·EY) × 100; height µm = Z mm × 1000; offsets µm =
 * DX, DY mm × 1000; volume µm³ = Vol mL × 10¹².
 */
export function pasteMeasurement(m: unknown, where: string): PadMeasurement | string {
	const designator = padName(m);
	if (!designator) return `${where}: no MeasurementName or CRDs (pad unknown)`;
	const vol = num(prop(m, 'Vol'));
	const eVol = num(prop(m, 'EVol'));
	if (vol === null || eVol === null)
		return `${where} (${designator}): Vol and EVol must be numbers`;
	if (eVol <= 0) return `${where} (${designator}): EVol must be above 0`;
	const a = num(prop(m, 'A'));
	const eA = num(prop(m, 'EA'));
	let areaPct: number;
	if (a !== null && eA !== null && eA > 0) areaPct = (a / eA) * 100;
	else {
		const x = num(prop(m, 'X'));
		const y = num(prop(m, 'Y'));
		const ex = num(prop(m, 'EX'));
		const ey = num(prop(m, 'EY'));
		if (x === null || y === null || ex === null || ey === null || ex <= 0 || ey <= 0) {
			return `${where} (${designator}): no area (A/EA or X, Y, EX, EY)`;
		}
		areaPct = ((x * y) / (ex * ey)) * 100;
	}
	const z = num(prop(m, 'Z'));
	if (z === null) return `${where} (${designator}): Z (height) must be a number`;
	const dx = num(prop(m, 'DX')) ?? 0;
	const dy = num(prop(m, 'DY')) ?? 0;
	const result = verdict(prop(m, 'Result'));
	if (!result)
		return `${where} (${designator}): Result "${String(prop(m, 'Result')).slice(0, 30)}" is not Passed/Failed`;
	return {
		...splitDesignator(designator),
		volumePct: (vol / eVol) * 100,
		areaPct,
		heightUm: z * UM_PER_MM,
		offsetXUm: dx * UM_PER_MM,
		offsetYUm: dy * UM_PER_MM,
		volumeUm3: Math.round(vol * UM3_PER_ML),
		result
	};
}

function mapInspected(
	base: { handle: string; atMs: number; messageName: string },
	b: Record<string, unknown>
): MapResult {
	const name = base.messageName;
	const inspected = list(prop(b, 'InspectedUnits'));
	if (inspected.length === 0) return q(`${name}: no InspectedUnits`);
	if (inspected.length > MAX_UNITS_PER_MESSAGE)
		return q(`${name}: ${inspected.length} units (limit ${MAX_UNITS_PER_MESSAGE})`);
	// Count the work before doing it.
	let total = 0;
	for (const u of inspected) {
		for (const insp of list(prop(u, 'Inspections'))) {
			total += list(prop(insp, 'Measurements')).length;
			for (const d of list(prop(insp, 'DefectsFound')))
				total += list(prop(d, 'RelatedMeasurements')).length;
		}
	}
	if (total > MAX_MEASUREMENTS_PER_MESSAGE)
		return q(`${name}: ${total} measurements (limit ${MAX_MEASUREMENTS_PER_MESSAGE})`);
	const out: InspectedUnit[] = [];
	for (let i = 0; i < inspected.length; i++) {
		const u = inspected[i];
		const where = `InspectedUnits[${i}]`;
		const unitIdentifier = text(prop(u, 'UnitIdentifier'));
		if (!unitIdentifier) return q(`${name}: ${where}.UnitIdentifier missing`);
		const pos = prop(u, 'UnitPositionNumber', 'PositionNumber');
		const positionNumber = pos === undefined || pos === null ? 1 : num(pos);
		if (
			positionNumber === null ||
			!Number.isInteger(positionNumber) ||
			positionNumber < 0 ||
			positionNumber > 65535
		) {
			return q(`${name}: ${where}.UnitPositionNumber must be a whole number 0–65535`);
		}
		// Measurements sit in Inspections[].Measurements and in DefectsFound[].RelatedMeasurements;
		// the same deposit may be in both (same UniqueIdentifier), so it is read once.
		const seen = new Set<string>();
		const pads: PadMeasurement[] = [];
		const inspections = list(prop(u, 'Inspections'));
		for (let j = 0; j < inspections.length; j++) {
			const insp = inspections[j];
			const sources: [unknown[], string][] = [
				[list(prop(insp, 'Measurements')), `${where}.Inspections[${j}].Measurements`]
			];
			const defects = list(prop(insp, 'DefectsFound'));
			for (let k = 0; k < defects.length; k++) {
				sources.push([
					list(prop(defects[k], 'RelatedMeasurements')),
					`${where}.Inspections[${j}].DefectsFound[${k}].RelatedMeasurements`
				]);
			}
			for (const [items, path] of sources) {
				for (let n = 0; n < items.length; n++) {
					const m = items[n];
					if (!isPasteMeasurement(m)) continue;
					// Same deposit twice (by id, or by pad name): the first reading counts.
					const id = text(prop(m, 'UniqueIdentifier'));
					const designator = `pad:${padName(m)}`;
					if ((id && seen.has(id)) || seen.has(designator)) continue;
					if (id) seen.add(id);
					seen.add(designator);
					const pad = pasteMeasurement(m, `${path}[${n}]`);
					if (typeof pad === 'string') return q(`${name}: ${pad}`);
					pads.push(pad);
				}
			}
		}
		const overall = verdict(prop(u, 'OverallResult'));
		out.push({
			unitIdentifier,
			positionNumber,
			result: overall === 'warn' ? 'pass' : overall,
			pads
		});
	}
	if (out.every((u) => u.pads.length === 0)) {
		return q(`${name}: no solder-paste measurements (SolderPasteMeasurement) in any unit`);
	}
	return {
		status: 'record',
		record: {
			...base,
			kind: 'units-inspected',
			transactionId: transactionId(b),
			recipeName: text(prop(b, 'RecipeName')),
			units: out
		}
	};
}
