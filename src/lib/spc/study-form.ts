import { RULE_IDS, type RuleId } from './run-rules';
import { SPC_API_CHARTS, type SpcAnalyzeRequest } from './analyze-request';
import { parseStudyText, type StudyTextError } from './parse-study-text';

type SpcChart = (typeof SPC_API_CHARTS)[number];

/** What the study form sends back to itself (strings as typed, so nothing is lost on error). */
export interface StudyFormValues {
	chart: string;
	data: string;
	lsl: string;
	usl: string;
	target: string;
	unit: string;
	rules: string[];
}

/** Form fields turned into an analyze request, or the problems by field. */
export type StudyFormResult =
	| {
			ok: true;
			values: StudyFormValues;
			request: SpcAnalyzeRequest;
			/** Turn an engine field (`subgroups[3][1]`, `values[7]`) into the pasted line. */
			where: (error: StudyTextError) => StudyTextError;
	  }
	| { ok: false; values: StudyFormValues; errors: StudyTextError[] };

function optionalNumber(raw: string, field: string, errors: StudyTextError[]): number | null {
	const text = raw.trim().replace(',', '.');
	if (!text) return null;
	const value = Number(text);
	if (!Number.isFinite(value)) {
		errors.push({ field, message: `"${raw.slice(0, 20)}" is not a number` });
		return null;
	}
	return value;
}

/**
 * Read the ad-hoc study form: chart kind, pasted rows, optional spec limits and rules. For I-MR
 * every number in reading order is one value (a single column or rows of values alike).
 * @example parseStudyForm(formData).ok
 */
export function parseStudyForm(form: FormData): StudyFormResult {
	const text = (name: string) => String(form.get(name) ?? '');
	const values: StudyFormValues = {
		chart: text('chart') || 'xbar-r',
		data: text('data').slice(0, 2_000_000),
		lsl: text('lsl'),
		usl: text('usl'),
		target: text('target'),
		unit: text('unit').slice(0, 20),
		rules: form.getAll('rules').map(String)
	};
	const errors: StudyTextError[] = [];
	const chart = values.chart;
	if (!(SPC_API_CHARTS as readonly string[]).includes(chart)) {
		errors.push({ field: 'chart', message: 'choose X̄/R, X̄/S, I-MR or between/within' });
	}
	const rules = values.rules.filter((r): r is RuleId =>
		(RULE_IDS as readonly string[]).includes(r)
	);
	const lsl = optionalNumber(values.lsl, 'lsl', errors);
	const usl = optionalNumber(values.usl, 'usl', errors);
	const target = optionalNumber(values.target, 'target', errors);
	const rows = parseStudyText(values.data);
	if (!rows.ok) errors.push(...rows.errors);
	if (errors.length || !rows.ok) return { ok: false, values, errors };
	const request: SpcAnalyzeRequest =
		chart === 'i-mr'
			? { chart, values: rows.rows.flat(), lsl, usl, target, rules }
			: {
					chart: chart as Exclude<SpcChart, 'i-mr'>,
					subgroups: rows.rows,
					lsl,
					usl,
					target,
					rules
				};
	const lineOf = rows.lineOf;
	const valueLines = rows.rows.flatMap((row, i) => row.map(() => lineOf[i]));
	const where = (error: StudyTextError): StudyTextError => {
		const m = /^(subgroups|values)(?:\[(\d+)\])?/.exec(error.field);
		if (!m) return error;
		if (m[2] === undefined) return { field: 'data', message: error.message };
		const line = m[1] === 'values' ? valueLines[Number(m[2])] : lineOf[Number(m[2])];
		return { field: 'data', message: `line ${line ?? '?'} (${error.field}): ${error.message}` };
	};
	return { ok: true, values, request, where };
}
