import type { StencilTechnology } from '$lib/stencil/thresholds';
import { TECHNOLOGY_LABELS } from '../labels';

/** What the adopt confirmation needs of a learned limit (page and server alike). */
export interface AdoptProposal {
	technology: StencilTechnology;
	currentMinAreaRatio: number;
	proposedMinAreaRatio: number | null;
	n: number;
	floor: number;
}

/** The confirmation that names the change: technology, from → to, and the evidence. */
export function adoptQuestion(p: AdoptProposal): {
	title: string;
	message: string;
	confirmLabel: string;
} {
	const name = TECHNOLOGY_LABELS[p.technology];
	return {
		title: `Adopt the learned limit for ${name}?`,
		message:
			`The minimum area ratio for ${name} changes from ${p.currentMinAreaRatio.toFixed(2)} to ` +
			`${p.proposedMinAreaRatio?.toFixed(2)}: where this site's prints reach a transfer ` +
			`efficiency of ${p.floor.toFixed(2)} (${p.n.toLocaleString('en-GB')} pads). Every ` +
			`${name} stencil is checked against it from then on; the change is recorded in the audit log.`,
		confirmLabel: `Adopt ${p.proposedMinAreaRatio?.toFixed(2)}`
	};
}
