/**
 * Safety texts shown beside the paste lot and stencil cleaning forms. They are general
 * cautions (REFERENCE-FACTS §e "Lead-containing paste", from memory and common practice) and
 * always defer to local regulations, the safety data sheet (SDS) and site procedures.
 */

/** Tin-lead ratios written without element symbols (63/37, 62/36/2, 60/40; common practice). */
const SNPB_RATIO = /(^|[^0-9.])(63\/37|62\/36\/2|60\/40)([^0-9]|$)/;

/** Phrases that mention lead only to say there is none. */
const LEAD_FREE = /\b(pb|lead)[\s-]?free\b|\bno[\s-]?(pb|lead)\b|\bnon[\s-]?(pb|lead)\b/gi;

/**
 * True when an alloy designation contains lead: the symbol Pb (any case: Sn63Pb37,
 * Sn62Pb36Ag2, SN63PB37), the words "lead"/"leaded"/"tin-lead", or a plain tin-lead ratio
 * (63/37). "Pb-free" and "lead-free" do not count. SAC305, SnAgCu, Sn42Bi58 contain no Pb.
 * Errs towards caution: text mentioning lead in any other way counts as leaded.
 * @example isLeadBearing('Sn63Pb37') // true
 * @example isLeadBearing('SAC305') // false
 */
export function isLeadBearing(alloy: string): boolean {
	if (typeof alloy !== 'string') return false;
	const text = alloy.replace(LEAD_FREE, ' ');
	return /pb/i.test(text) || /\blead(ed)?\b/i.test(text) || SNPB_RATIO.test(text);
}

/**
 * Caution text for lead-containing paste, one point per line, for the lot and run forms.
 * @example leadHandlingCaution()[0] // 'This paste contains lead (Pb), which is toxic. …'
 */
export function leadHandlingCaution(): string[] {
	return [
		'This paste contains lead (Pb), which is toxic. Follow local regulations, the safety data sheet (SDS) and your site procedures; they take precedence over this note.',
		'Wear gloves; do not eat, drink or smoke where paste is handled; wash your hands before breaks and after work.',
		'Collect waste paste, used wipes and cleaning residue as hazardous waste, separate from lead-free waste.',
		'Keep leaded and lead-free lines, tools, squeegees and stencils segregated and clearly labelled.',
		'Provide fume extraction at reflow.'
	];
}

/**
 * Caution text for cleaning stencils and squeegees with solvents (common practice).
 * @example solventCleaningCaution().length // 4
 */
export function solventCleaningCaution(): string[] {
	return [
		'Follow the cleaning agent\u2019s safety data sheet (SDS) and your site procedures; they take precedence over this note.',
		'Work with good ventilation or local extraction.',
		'Wear chemical-resistant gloves and eye protection.',
		'Keep flammable solvents away from ignition sources and store them closed in approved containers.'
	];
}
