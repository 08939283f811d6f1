import { describe, expect, it } from 'vitest';
import { describeSignal, digestMail, signalMail } from './signal-text';

const chart = { name: 'Paste volume', productCode: 'PB-100', lineCodes: ['SMT-1'], unit: '%' };
const signal = {
	rule: 'we-1',
	chartPart: 'location',
	pointKey: 'board:88',
	pointKeys: ['board:88'],
	pointAt: new Date('2026-11-02T06:05:00Z'),
	value: 131.23456789
};

describe('signal mails', () => {
	it('one line per signal: rule, chart part, point, value to 6 digits with its unit, time', () => {
		const line = describeSignal(signal, chart);
		expect(line).toMatch(/^- .* \(rule we-1\) on the location chart: /);
		expect(line).toContain(' value 131.235 %');
		expect(line).toContain(' at 2026-11-02 06:05 UTC; 1 point in the pattern');
	});

	it('a CFX board is named by its serial when known, else as the machine board, never by its key', () => {
		const cfx = { ...signal, pointKey: 'cfx-unit:12', pointKeys: ['cfx-unit:12'] };
		expect(describeSignal({ ...cfx, pointSerial: 'FW-LM48-000777' }, chart)).toContain(
			'on the location chart: board FW-LM48-000777 value'
		);
		const unknown = describeSignal(cfx, chart);
		expect(unknown).toContain('on the location chart: machine board #12 value');
		expect(unknown).not.toContain('cfx-unit');
	});

	it('the follower mail names the chart, links to it and to acknowledge', () => {
		const mail = signalMail(
			'https://rollbead.example',
			7,
			chart,
			[signal, signal],
			'Capability: x.'
		);
		expect(mail.subject).toMatch(/^\[Rollbead\] 2 signals on Paste volume: /);
		expect(mail.text).toContain('New run-rule signals on Paste volume · PB-100 · SMT-1:');
		expect(mail.text).toContain('Capability: x.');
		expect(mail.text).toContain('https://rollbead.example/charts/7');
		expect(mail.text).toContain('https://rollbead.example/signals?status=open&chart=7');
	});

	it('the digest counts every run over its charts', () => {
		const mail = digestMail('https://rollbead.example', [
			{ chartId: 7, chart, signals: [signal, signal], assessment: 'Capability: a.' },
			{ chartId: 9, chart: undefined, signals: [signal], assessment: 'Capability: b.' }
		]);
		expect(mail.subject).toBe('[Rollbead] Digest: 3 new signal runs');
		expect(mail.text).toMatch(/^3 new signal runs on 2 charts in the last few minutes:/);
		expect(mail.text).toContain('Chart #9 — https://rollbead.example/charts/9');
	});
});
