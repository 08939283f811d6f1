import { pointKeyWords } from './point-key';
import { RULE_DESCRIPTIONS, type RuleId } from './run-rules';

/** The fields of a stored signal a mail line names. */
export interface SignalText {
	rule: string;
	chartPart: string;
	pointKey: string;
	/** The board serial of the point, when the caller knows it (named instead of the key). */
	pointSerial?: string | null;
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
	return `- ${ruleText(s.rule)} (rule ${s.rule}) on the ${s.chartPart.replace('-', ' ')} chart: ${pointKeyWords(s.pointKey, s.pointSerial)}${value}${when}; ${n} point${n === 1 ? '' : 's'} in the pattern`;
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

/** The chart a mail is about, with the names a reader knows it by. */
type MailChart = { name: string; productCode: string; lineCodes: string[]; unit: string };

/**
 * The mail to a chart's follower about its new signal runs: what fired where, the capability
 * line, and links to the chart and to acknowledge (`origin` is the app's configured ORIGIN).
 */
export function signalMail(
	origin: string,
	chartId: number,
	c: MailChart | undefined,
	signals: SignalText[],
	assessment: string
): { subject: string; text: string } {
	const subject = `[Rollbead] ${signals.length === 1 ? 'Signal' : `${signals.length} signals`} on ${c?.name ?? `chart #${chartId}`}: ${ruleText(signals[0].rule)}`;
	const text = [
		`New run-rule signal${signals.length === 1 ? '' : 's'} on ${chartLine(c, chartId)}:`,
		'',
		...signals.map((s) => describeSignal(s, c)),
		'',
		assessment,
		'',
		`Open the chart: ${origin}/charts/${chartId}`,
		`Acknowledge with the cause and action: ${origin}/signals?status=open&chart=${chartId}`,
		'',
		'You get this because you follow this chart in Rollbead.'
	].join('\n');
	return { subject, text };
}

/** One digest of the signal runs that waited, chart by chart. */
export function digestMail(
	origin: string,
	charts: {
		chartId: number;
		chart: MailChart | undefined;
		signals: SignalText[];
		assessment: string;
	}[]
): { subject: string; text: string } {
	const runs = charts.reduce((n, c) => n + c.signals.length, 0);
	const text = [
		`${runs} new signal run${runs === 1 ? '' : 's'} on ${charts.length} chart${charts.length === 1 ? '' : 's'} in the last few minutes:`,
		...charts.flatMap(({ chartId, chart, signals, assessment }) => [
			'',
			`${chartLine(chart, chartId)} — ${origin}/charts/${chartId}`,
			...signals.map((s) => describeSignal(s, chart)),
			assessment
		]),
		'',
		`Open signals: ${origin}/signals?status=open`
	].join('\n');
	return { subject: `[Rollbead] Digest: ${runs} new signal run${runs === 1 ? '' : 's'}`, text };
}
