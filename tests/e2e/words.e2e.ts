import { expect, test } from '@playwright/test';
import { ROLES } from '../../src/lib/access';
import { signInAs } from './helpers';
import { everyPage } from './every-page';

/**
 * Issue 13: every label is a word a user would say. Internal text that reached the screen before:
 * "REFERENCE-FACTS:", squeegeeSpeedMmS, run:15, subgroups[1], "Recipe for on", "Type 3: Type 3:",
 * 4.588722 kg in a field, an axis tick 5e-10.
 */
// Unit symbols and names written with capitals inside (not code identifiers).
const ALLOWED_MIXED_CASE = new Set([
	'mPa',
	'kPa',
	'mL',
	'iOS',
	'eMail',
	'kHz',
	'mV',
	'mA',
	'kN',
	'dB',
	'µm',
	'pH'
]);

function problems(text: string): string[] {
	const out: string[] = [];
	const add = (what: string, m: RegExpMatchArray | null) => {
		if (!m) return;
		const at = m.index ?? 0;
		const context = text.slice(Math.max(0, at - 30), at + m[0].length + 30).replace(/\s+/g, ' ');
		out.push(`${what}: "${m[0]}" in "…${context}…"`);
	};
	for (const m of text.matchAll(/\b[a-z]+[A-Z][A-Za-z0-9]*\b/g)) {
		if (!ALLOWED_MIXED_CASE.has(m[0])) add('camelCase identifier', m);
	}
	add('index in brackets', text.match(/\w\[\d+\]/));
	add('missing value', text.match(/\b(undefined|NaN|null)\b/));
	// "Recipe for on" (no product, no line); "act on." ends a sentence well, so only "for" alone.
	add('dangling for/on', text.match(/\b(?:for|on) (?:for|on)\b|\bfor(?= *(?:$|[·,.:;)]))/m));
	add('doubled label', text.match(/(\b[A-Za-z][\w-]*(?: \d+)?:) \1/));
	// Within one line of text (table cells side by side may repeat a value).
	add('doubled word', text.match(/\b([A-Za-z]{3,}) +\1\b/));
	add('internal reference', text.match(/REFERENCE-FACTS/));
	add('point key', text.match(/\b(run|board):\d+/));
	add('exponent notation', text.match(/\b\d(?:\.\d+)?e[-+]?\d+\b/));
	return out;
}

test.describe.configure({ timeout: 300_000 });

for (const role of ROLES) {
	test(`every page reads in plain words as ${role}`, async ({ page }) => {
		await signInAs(page, role);
		const pages = await everyPage(page, role);
		expect(pages.length).toBeGreaterThan(15);
		const found: string[] = [];
		for (const path of pages) {
			const response = await page.goto(path);
			// A page the role may not use answers with the friendly 403 page, which is checked too.
			expect([200, 403], path).toContain(response?.status());
			await page.waitForLoadState('networkidle');
			const text = await page.locator('body').evaluate((b) => {
				const svgText = [...b.querySelectorAll('svg text')]
					.map((t) => t.textContent ?? '')
					.join('\n');
				// Raw records shown on purpose (the audit trail's before/after JSON) and literal
				// values in <code> (a token's random prefix, a file name) are not labels.
				const pres = [...b.querySelectorAll('pre, code')] as HTMLElement[];
				for (const pre of pres) pre.style.display = 'none';
				const text = (b as HTMLElement).innerText;
				for (const pre of pres) pre.style.display = '';
				return `${text}\n${svgText}`;
			});
			for (const p of problems(text)) found.push(`${path}: ${p}`);
			// Numbers in fields keep their field's precision (at most 3 decimals shown).
			const fields = await page
				.locator('input:not([type=hidden]):not([type=checkbox]):not([type=radio])')
				.evaluateAll((els) =>
					els.map((e) => ({
						id: e.id || (e as HTMLInputElement).name,
						value: (e as HTMLInputElement).value
					}))
				);
			for (const f of fields) {
				if (/^-?\d+\.\d{4,}$/.test(f.value))
					found.push(`${path}: field ${f.id} prefilled as ${f.value}`);
			}
		}
		expect([...new Set(found)]).toEqual([]);
	});
}
