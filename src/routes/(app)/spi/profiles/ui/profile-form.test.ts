import { describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE, type MappingProfile } from '$lib/ingest';
import { profileForm, profileFromForm } from './profile-form';

describe('profile form', () => {
	it('reads back the profile it was filled from', () => {
		const profile: MappingProfile = {
			...CANONICAL_PROFILE,
			name: 'Line 2 inspector',
			machine: 'SPI line 2',
			delimiter: ';',
			decimalComma: true,
			columns: { height_um: 'Height(um)', refdes: 'Comp' },
			lengthUnit: 'mm',
			resultWords: { pass: ['OK', 'Good'], warn: ['Warning'], fail: ['NG'] },
			serialFromFileName: { pattern: '^(\\w+)_' },
			constants: { line: 'L2', panelIndex: 0 },
			onBadRow: 'skip-row'
		};
		expect(profileFromForm(profileForm(profile))).toEqual(profile);
	});

	it('trims typed text and leaves empty parts out', () => {
		const form = profileForm({ ...CANONICAL_PROFILE, name: '', machine: '' });
		form.name = '  Fenmoor export ';
		form.columns = { height_um: ' H ', volume_pct: '   ' };
		form.passWords = ' OK , , Pass ';
		form.serialPattern = '   ';
		form.constPanel = ' 3 ';
		const profile = profileFromForm(form);
		expect(profile.name).toBe('Fenmoor export');
		expect(profile.columns).toEqual({ height_um: 'H' });
		expect(profile.resultWords.pass).toEqual(['OK', 'Pass']);
		expect(profile.serialFromFileName).toBeUndefined();
		expect(profile.constants).toEqual({ panelIndex: 3 });
	});
});
