/**
 * Solder powder types (IPC J-STD-005 particle size table) and the five-ball rule for choosing
 * a powder fine enough for the narrowest apertures. Sources and confidence per value are in
 * reference/stencil/j-std-005-powder.json.
 */
import { apertureLabel, type ApertureInput } from './aperture';
import { apertureGeometry } from './geometry';

/** J-STD-005 powder type number (Type 8 was added in J-STD-005A). */
export type PowderType = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8;

/** Particle size limits of one powder type, µm. */
export interface PowderSize {
	type: PowderType;
	/** No particle larger than this. */
	noneLargerThanUm: number;
	/** Less than 1 % larger than this. */
	underOnePercentLargerThanUm: number;
	/** The main range (most of the mass lies between these): lower and upper bound. */
	mainRangeMinUm: number;
	mainRangeMaxUm: number;
	/** At most 10 % smaller than this. */
	maxTenPercentSmallerThanUm: number;
}

function row(
	type: PowderType,
	noneLargerThanUm: number,
	underOnePercentLargerThanUm: number,
	mainRangeMinUm: number,
	mainRangeMaxUm: number,
	maxTenPercentSmallerThanUm: number
): PowderSize {
	return {
		type,
		noneLargerThanUm,
		underOnePercentLargerThanUm,
		mainRangeMinUm,
		mainRangeMaxUm,
		maxTenPercentSmallerThanUm
	};
}

/**
 * J-STD-005 Table 3-2 as remembered (see the reference file: main ranges of Types 3–7 are
 * confirmed by trade sources; Types 1, 2 and 8 and the other columns are from memory).
 */
export const POWDER_SIZES: readonly PowderSize[] = Object.freeze([
	// type, none larger than, < 1 % larger than, main range min–max, ≤ 10 % smaller than
	row(1, 160, 150, 75, 150, 20),
	row(2, 80, 75, 45, 75, 20),
	row(3, 50, 45, 25, 45, 20),
	row(4, 40, 38, 20, 38, 20),
	row(5, 30, 25, 15, 25, 15),
	row(6, 20, 15, 5, 15, 5),
	row(7, 15, 11, 2, 11, 2),
	row(8, 11, 10, 2, 8, 2)
]);

/** Five-ball rule (common practice): at least this many of the largest particles across. */
export const DEFAULT_MIN_PARTICLES_ACROSS = 5;

/**
 * The particle size used by the five-ball rule: the top of the type's main range.
 * @throws {RangeError} for a type outside 1–8.
 * @example largestParticleUm(4) // 38
 */
export function largestParticleUm(type: PowderType): number {
	const found = POWDER_SIZES.find((p) => p.type === type);
	if (!found)
		throw new RangeError(`powder, type: unknown J-STD-005 type ${String(type)}; expected 1–8`);
	return found.mainRangeMaxUm;
}

/**
 * Narrowest aperture opening a powder type suits: minParticles × largest particle.
 * @example minApertureWidthUm(3) // 225
 */
export function minApertureWidthUm(
	type: PowderType,
	minParticlesAcross = DEFAULT_MIN_PARTICLES_ACROSS
): number {
	return minParticlesAcross * largestParticleUm(type);
}

/** One aperture that is too narrow for a powder type. */
export interface PowderWarning {
	index: number;
	label: string;
	minDimensionUm: number;
	/** How many of the largest particles fit across the narrowest opening (unrounded). */
	particlesAcross: number;
	message: string;
}

/**
 * Apertures whose narrowest opening holds fewer than `minParticlesAcross` of the type's largest
 * particles (five-ball rule, common practice; some use 4, or 8 for round/square openings).
 * @throws {StencilInputError} for an invalid aperture; {RangeError} for an unknown type.
 * @example powderWarnings([qfp04Pad], 3) // one warning: 200 µm holds 4.44 Type 3 particles
 */
export function powderWarnings(
	apertures: readonly ApertureInput[],
	type: PowderType,
	minParticlesAcross = DEFAULT_MIN_PARTICLES_ACROSS
): PowderWarning[] {
	const particle = largestParticleUm(type);
	const warnings: PowderWarning[] = [];
	apertures.forEach((a, index) => {
		const d = apertureGeometry(a, index).minDimensionUm;
		const across = d / particle;
		if (across < minParticlesAcross)
			warnings.push({
				index,
				label: apertureLabel(a, index),
				minDimensionUm: d,
				particlesAcross: across,
				message:
					`${apertureLabel(a, index)}: only ${across.toFixed(2)} Type ${type} particles ` +
					`(${particle} µm) fit across ${d.toFixed(1)} µm; ` +
					`at least ${minParticlesAcross} are recommended`
			});
	});
	return warnings;
}

/** Result of `suggestPowderType`. `type` is null when no aperture is given or none fits. */
export interface PowderSuggestion {
	type: PowderType | null;
	/** The aperture with the narrowest opening, which decides the type. */
	limitingIndex: number | null;
	limitingLabel: string | null;
	limitingMinDimensionUm: number | null;
	message: string;
}

/**
 * The coarsest powder type (lowest number, usually cheapest and least prone to oxidation) for
 * which every aperture's narrowest opening is ≥ minParticles × largest particle.
 * @param minDimensionsUm each aperture's narrowest opening as already computed (a read computes
 *   geometry once); when left out, each aperture is checked and computed here.
 * @throws {StencilInputError} for an invalid aperture.
 * @example suggestPowderType([qfp04Pad]) // { type: 4, limitingMinDimensionUm: 200, … } (5 × 38 = 190 ≤ 200)
 */
export function suggestPowderType(
	apertures: readonly ApertureInput[],
	minParticlesAcross = DEFAULT_MIN_PARTICLES_ACROSS,
	minDimensionsUm?: readonly number[]
): PowderSuggestion {
	if (apertures.length === 0)
		return {
			type: null,
			limitingIndex: null,
			limitingLabel: null,
			limitingMinDimensionUm: null,
			message: 'no apertures to suggest a powder type for'
		};
	let limitingIndex = 0;
	let minDim = Infinity;
	apertures.forEach((a, i) => {
		const d = minDimensionsUm ? minDimensionsUm[i] : apertureGeometry(a, i).minDimensionUm;
		if (d < minDim) {
			minDim = d;
			limitingIndex = i;
		}
	});
	const label = apertureLabel(apertures[limitingIndex], limitingIndex);
	const fit = POWDER_SIZES.find((p) => minDim >= minParticlesAcross * p.mainRangeMaxUm);
	return {
		type: fit ? fit.type : null,
		limitingIndex,
		limitingLabel: label,
		limitingMinDimensionUm: minDim,
		message: fit
			? `Type ${fit.type}: the narrowest opening, ${label} at ${minDim.toFixed(1)} µm, ` +
				`holds ${(minDim / fit.mainRangeMaxUm).toFixed(2)} particles ` +
				`of up to ${fit.mainRangeMaxUm} µm`
			: `no J-STD-005 type fits: ${label} is only ${minDim.toFixed(1)} µm wide, ` +
				`below ${minParticlesAcross} × ${POWDER_SIZES[POWDER_SIZES.length - 1].mainRangeMaxUm} µm`
	};
}
