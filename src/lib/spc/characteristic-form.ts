/**
 * Turn the characteristic form's fields into the input `createCharacteristic` and
 * `updateCharacteristic` validate (blank spec fields mean "no limit").
 * @example characteristicFromForm(formData).measure
 */
export function characteristicFromForm(form: FormData): Record<string, unknown> {
	const text = (name: string) => String(form.get(name) ?? '').trim();
	const num = (name: string) => {
		const t = text(name).replace(',', '.');
		return t === '' ? null : Number(t);
	};
	const int = (name: string, fallback: number) => {
		const t = text(name);
		return t === '' ? fallback : Number(t);
	};
	const padKind = text('padKind') || 'all';
	const padSelection =
		padKind === 'refdes'
			? {
					kind: 'refdes',
					refdes: text('refdes')
						.split(/[\s,;]+/)
						.filter(Boolean)
				}
			: padKind === 'area-ratio'
				? { kind: 'area-ratio', min: num('arMin'), max: num('arMax') }
				: { kind: 'all' };
	return {
		name: text('name'),
		productId: int('productId', 0),
		lineIds: form.getAll('lineIds').map(Number),
		measure: text('measure'),
		parameterKey: text('parameterKey') || null,
		padSelection,
		subgroupMode: text('subgroupMode') || 'board',
		subgroupSize: int('subgroupSize', 1),
		chartKind: text('chartKind'),
		lsl: num('lsl'),
		target: num('target'),
		usl: num('usl'),
		unit: text('unit') || undefined,
		rules: form.getAll('rules').map(String)
	};
}
