import type { StencilTechnology } from '$lib/stencil/thresholds';

/** Display names of the stencil technologies. */
export const TECHNOLOGY_LABELS: Record<StencilTechnology, string> = {
	'laser-stainless': 'Laser-cut stainless',
	electroformed: 'Electroformed',
	'laser-nano-coated': 'Laser-cut, nano-coated',
	step: 'Step stencil'
};

/** Display names of aperture shapes. */
export const SHAPE_LABELS: Record<string, string> = {
	rectangle: 'Rectangle',
	'rounded-rectangle': 'Rounded rect.',
	circle: 'Circle',
	polygon: 'Polygon'
};
