import { CANONICAL_FIELDS, type CanonicalField, type MappingProfile } from '$lib/ingest';

/**
 * A mapping profile as the editor's inputs hold it: word lists and constants as the text typed,
 * so a half-typed value stays as written until the profile is read back with `profileFromForm`.
 */
export interface ProfileForm {
	name: string;
	machine: string;
	delimiter: MappingProfile['delimiter'];
	decimalComma: boolean;
	columns: Partial<Record<CanonicalField, string>>;
	lengthUnit: MappingProfile['lengthUnit'];
	volumeMode: MappingProfile['volumeMode'];
	timestampFormat: string;
	timeZone: string;
	passWords: string;
	warnWords: string;
	failWords: string;
	serialPattern: string;
	constLine: string;
	constProduct: string;
	constPanel: string;
	onBadRow: MappingProfile['onBadRow'];
}

export function profileForm(profile: MappingProfile): ProfileForm {
	return {
		name: profile.name,
		machine: profile.machine,
		delimiter: profile.delimiter,
		decimalComma: profile.decimalComma,
		columns: { ...profile.columns },
		lengthUnit: profile.lengthUnit,
		volumeMode: profile.volumeMode,
		timestampFormat: profile.timestampFormat,
		timeZone: profile.timeZone,
		passWords: profile.resultWords.pass.join(', '),
		warnWords: profile.resultWords.warn.join(', '),
		failWords: profile.resultWords.fail.join(', '),
		serialPattern: profile.serialFromFileName?.pattern ?? '',
		constLine: profile.constants?.line ?? '',
		constProduct: profile.constants?.product ?? '',
		constPanel:
			profile.constants?.panelIndex === undefined ? '' : String(profile.constants.panelIndex),
		onBadRow: profile.onBadRow
	};
}

const words = (s: string) =>
	s
		.split(',')
		.map((w) => w.trim())
		.filter(Boolean);

/** The profile the form describes, trimmed; empty inputs leave their part out. */
export function profileFromForm(form: ProfileForm): MappingProfile {
	const cols: Partial<Record<CanonicalField, string>> = {};
	for (const f of CANONICAL_FIELDS) if (form.columns[f]?.trim()) cols[f] = form.columns[f]!.trim();
	const constants: MappingProfile['constants'] = {};
	if (form.constLine.trim()) constants.line = form.constLine.trim();
	if (form.constProduct.trim()) constants.product = form.constProduct.trim();
	if (form.constPanel.trim() !== '') constants.panelIndex = Number(form.constPanel);
	const serialPattern = form.serialPattern.trim();
	return {
		name: form.name.trim(),
		machine: form.machine.trim(),
		delimiter: form.delimiter,
		decimalComma: form.decimalComma,
		columns: cols,
		lengthUnit: form.lengthUnit,
		volumeMode: form.volumeMode,
		timestampFormat: form.timestampFormat.trim(),
		timeZone: form.timeZone.trim(),
		resultWords: {
			pass: words(form.passWords),
			warn: words(form.warnWords),
			fail: words(form.failWords)
		},
		...(serialPattern ? { serialFromFileName: { pattern: serialPattern } } : {}),
		...(Object.keys(constants).length ? { constants } : {}),
		onBadRow: form.onBadRow
	};
}
