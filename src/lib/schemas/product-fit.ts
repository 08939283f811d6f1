import { z } from 'zod';
import { BOARD_SIDES } from '$lib/printlog/product-fit';

const code = z.string().trim().min(1, 'must not be blank').max(64, 'must be at most 64 characters');

/**
 * `PUT /api/products/{id}/fit` and the product-fit form: the whole rule set of one product,
 * replacing the previous one. Empty lists mean "no rule of that kind" (runs are warned, not
 * refused). Bounded so a hostile body cannot make the server do much work.
 */
export const productFitSchema = z.strictObject({
	approvals: z
		.array(z.strictObject({ stencil: code, side: z.enum(BOARD_SIDES) }))
		.max(200, 'at most 200 approvals'),
	alloys: z
		.array(
			z
				.string()
				.trim()
				.min(1, 'must not be blank')
				.max(40, 'must be at most 40 characters')
				.regex(/^[A-Za-z0-9 .+_-]+$/, 'letters, digits, spaces and . + _ - only')
		)
		.max(50, 'at most 50 alloys'),
	// IPC J-STD-005 powder types run from 1 (coarsest) to 8.
	powderTypes: z
		.array(
			z
				.number()
				.int('must be a whole number')
				.min(1, 'must be a powder type from 1 to 8')
				.max(8, 'must be a powder type from 1 to 8')
		)
		.max(8, 'at most 8 powder types')
});

export type ProductFitPayload = z.output<typeof productFitSchema>;
