import { pointKeyWords } from './point-key';
import { RULE_DESCRIPTIONS, type RuleId } from './run-rules';

/** The fields of a stored signal a mail line names. */
export interface SignalText {
	rule: string;
	chartPart: string;
	pointKey: string;
	pointKeys: string[];
	pointAt: Date | null;
	value: number | null;
}

/** A rule's words, or its id when unknown. */
export function ruleText(rule: string): string {
	return RULE_DESCRIPTIONS[rule as RuleId] ?? rule;
}

/** One signal as a line of a mail: rule, chart part, point, value, time and pattern size. */
export function describeSignal(s: SignalText, c: { unit: string } | undefined): string {
	const value =
		s.value == null ? '' : ` value ${Number(s.value.toPrecision(6))}${c?.unit ? ' ' + c.unit : ''}`;
	const when = s.pointAt ? ` at ${s.pointAt.toISOString().slice(0, 16).replace('T', ' ')} UTC` : '';
	const n = s.pointKeys.length;
	return `- ${ruleText(s.rule)} (rule ${s.rule}) on the ${s.chartPart.replace('-', ' ')} chart: ${pointKeyWords(s.pointKey)}${value}${when}; ${n} point${n === 1 ? '' : 's'} in the pattern`;
}

/** A chart named for a mail: name, product and lines. */
export function chartLine(
	c: { name: string; productCode: string; lineCodes: string[] } | undefined,
	id: number
): string {
	if (!c) return `Chart #${id}`;
	const where = c.lineCodes.length ? c.lineCodes.join(', ') : 'all lines';
	return `${c.name} · ${c.productCode} · ${where}`;
}
