/**
 * Words for the line events machines report over CFX (what `cfx_line_events` holds), for the
 * technician's line view and the admin page: a short title, the detail that matters, and a tone
 * (a fault stands out). Pure; unknown kinds and odd detail values are shown, never dropped.
 */

export type MachineEventTone = 'fault' | 'ok' | 'info';

export interface MachineEventWords {
	title: string;
	detail: string;
	tone: MachineEventTone;
}

const TITLES: Record<string, [string, MachineEventTone]> = {
	'work-started': ['Work started', 'info'],
	'work-completed': ['Work completed', 'info'],
	'run-opened': ['Run opened by the printer', 'info'],
	'stencil-changed': ['Stencil changed', 'info'],
	'squeegee-changed': ['Squeegee changed', 'info'],
	'tool-changed': ['Tool changed', 'info'],
	'stencil-cleaned': ['Stencil cleaned', 'ok'],
	'squeegee-cleaned': ['Squeegee cleaned', 'ok'],
	fault: ['Fault', 'fault'],
	'fault-cleared': ['Fault cleared', 'ok'],
	'station-state': ['Machine state', 'info']
};

/** Longest text of one detail value shown (a hostile sender may send a novel). */
const MAX_VALUE_CHARS = 120;

function text(v: unknown): string | null {
	if (v === null || v === undefined || v === '') return null;
	const s =
		typeof v === 'string'
			? v
			: typeof v === 'number' || typeof v === 'boolean'
				? String(v)
				: JSON.stringify(v);
	return s.length > MAX_VALUE_CHARS ? `${s.slice(0, MAX_VALUE_CHARS - 1)}…` : s;
}

function seconds(ms: unknown): string | null {
	return typeof ms === 'number' && Number.isFinite(ms) && ms >= 0
		? `${(ms / 1000).toFixed(0)} s`
		: null;
}

const join = (...parts: (string | null | false)[]) => parts.filter(Boolean).join(' · ');

/**
 * @example machineEventWords('stencil-changed', { oldName: 'ST-1', newName: 'ST-2' })
 * // { title: 'Stencil changed', detail: 'ST-1 → ST-2', tone: 'info' }
 */
export function machineEventWords(
	kind: string,
	detail: Record<string, unknown>
): MachineEventWords {
	const [title, tone] = TITLES[kind] ?? [kind.replace(/-/g, ' '), 'info' as const];
	const d = detail ?? {};
	switch (kind) {
		case 'work-started':
		case 'work-completed': {
			const n = typeof d.units === 'number' ? d.units : null;
			return {
				title,
				detail: join(
					n !== null && `${n} board${n === 1 ? '' : 's'}`,
					text(d.result) && `result ${text(d.result)}`
				),
				tone:
					kind === 'work-completed' && /fail|error|abort/i.test(String(d.result ?? ''))
						? 'fault'
						: tone
			};
		}
		case 'run-opened':
			return {
				title,
				detail: join(text(d.runId) && `run ${text(d.runId)}`, text(d.product)),
				tone
			};
		case 'stencil-changed':
		case 'squeegee-changed':
		case 'tool-changed':
			return { title, detail: `${text(d.oldName) ?? '—'} → ${text(d.newName) ?? '—'}`, tone };
		case 'stencil-cleaned':
			return {
				title,
				detail: join(
					text(d.stencil),
					text(d.mode) && `mode ${text(d.mode)}`,
					typeof d.cyclesSinceLastClean === 'number' &&
						`${d.cyclesSinceLastClean} prints since the last clean`,
					seconds(d.durationMs)
				),
				tone
			};
		case 'squeegee-cleaned':
			return {
				title,
				detail: join(
					text(d.squeegee),
					text(d.mode) && `mode ${text(d.mode)}`,
					seconds(d.durationMs)
				),
				tone
			};
		case 'fault':
			return {
				title,
				detail: join(
					text(d.code),
					text(d.description),
					text(d.cause),
					text(d.severity) && `severity ${text(d.severity)}`
				),
				tone
			};
		case 'fault-cleared':
			return { title, detail: '', tone };
		case 'station-state':
			return {
				title,
				detail: `${text(d.oldState) ?? '—'} → ${text(d.newState) ?? '—'}`,
				tone: /down|fault|error/i.test(String(d.newState ?? '')) ? 'fault' : tone
			};
		default:
			return {
				title,
				detail: join(
					...Object.entries(d)
						.slice(0, 6)
						.map(([k, v]) => (text(v) === null ? null : `${k}: ${text(v)}`))
				),
				tone
			};
	}
}
