import type { SuperForm } from 'sveltekit-superforms';
import type { RunForm } from '$lib/schemas/printlog-forms';

/** The stores of the run form that its parts bind to (values and errors). */
export type RunFormStores = Pick<SuperForm<RunForm>, 'form' | 'errors'>;
