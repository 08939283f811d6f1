import { describe, expect, it } from 'vitest';
import { sameOriginPath, sameOriginUrl } from './safe-redirect';

const ORIGIN = 'https://rollbead.fenmoor.example';

describe('sameOriginPath', () => {
	it('keeps paths on our origin, with query and fragment', () => {
		expect(sameOriginPath('/factory', ORIGIN)).toBe('/factory');
		expect(sameOriginPath('/print-runs?line=SMT1&x=%2F%2Fa#top', ORIGIN)).toBe(
			'/print-runs?line=SMT1&x=%2F%2Fa#top'
		);
		expect(sameOriginPath('/a/../b', ORIGIN)).toBe('/b');
	});

	it('refuses anything a browser could read as another host', () => {
		for (const hostile of [
			'//evil.example',
			'/\\evil.example',
			'/\\/evil.example',
			'\\\\evil.example',
			'/\t/evil.example',
			'/\n/evil.example',
			'/\r\n/evil.example',
			'https://evil.example/',
			'http:evil.example',
			'javascript:alert(1)',
			'evil.example',
			'',
			'/%5Cevil',
			`/${'a'.repeat(3000)}`
		]) {
			const path = sameOriginPath(hostile, ORIGIN);
			expect(path.startsWith('/') && !path.startsWith('//'), hostile).toBe(true);
			expect(new URL(path, ORIGIN).origin, hostile).toBe(ORIGIN);
		}
		expect(sameOriginPath('/\\evil.example', ORIGIN)).toBe('/');
		expect(sameOriginPath('//evil.example', ORIGIN)).toBe('/');
		expect(sameOriginPath(null, ORIGIN)).toBe('/');
		expect(sameOriginPath(42, ORIGIN, '/home')).toBe('/home');
	});
});

describe('sameOriginUrl (Auth.js redirects)', () => {
	it('answers absolute URLs on ORIGIN only', () => {
		expect(sameOriginUrl(`${ORIGIN}/factory`, ORIGIN)).toBe(`${ORIGIN}/factory`);
		expect(sameOriginUrl('/factory', ORIGIN)).toBe(`${ORIGIN}/factory`);
		expect(sameOriginUrl('https://evil.example/factory', ORIGIN)).toBe(`${ORIGIN}/`);
		expect(sameOriginUrl(`${ORIGIN}.evil.example/x`, ORIGIN)).toBe(`${ORIGIN}/`);
		expect(sameOriginUrl(`${ORIGIN}/\\evil.example`, ORIGIN)).toBe(`${ORIGIN}/`);
		expect(sameOriginUrl(ORIGIN, ORIGIN)).toBe(`${ORIGIN}/`);
	});
});
