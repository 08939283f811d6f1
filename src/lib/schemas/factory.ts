import { z } from 'zod';

/** Codes are what barcode labels and machine exports carry: short, no spaces. */
export const codeSchema = z
	.string({ error: 'code is required' })
	.trim()
	.min(1, { error: 'code is required' })
	.max(32, { error: 'code must be at most 32 characters' })
	.regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, {
		error: 'code may use letters, digits and . _ / - (no spaces), starting with a letter or digit'
	});

export const nameSchema = z
	.string({ error: 'name is required' })
	.trim()
	.min(1, { error: 'name is required' })
	.max(120, { error: 'name must be at most 120 characters' });

export const lineInputSchema = z.object({ code: codeSchema, name: nameSchema });
export const productInputSchema = z.object({ code: codeSchema, name: nameSchema });
export type CodeNameInput = z.infer<typeof lineInputSchema>;
