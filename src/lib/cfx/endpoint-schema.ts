import { z } from 'zod';

/** Body of POST /api/cfx/endpoints and the admin form: a machine's CFX handle → its line. */
export const cfxEndpointSchema = z.object({
	handle: z
		.string()
		.trim()
		.min(1, 'give the CFX handle the machine sends as Source')
		.max(200, 'at most 200 characters')
		.refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'control characters are not allowed'),
	line: z.string().trim().min(1, 'give the line code').max(100, 'at most 100 characters'),
	kind: z.enum(['printer', 'inspection'], { message: 'kind must be "printer" or "inspection"' })
});

export type CfxEndpointInput = z.infer<typeof cfxEndpointSchema>;

/** Body of POST /api/cfx/pending/{id}/assign. */
export const cfxAssignSchema = z.object({
	product: z.string().trim().min(1, 'give the product code').max(100, 'at most 100 characters')
});
