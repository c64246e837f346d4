import { z } from 'zod';
import { requiredText } from '@/lib/zod-fields';

/** A manager settles a payout exception: take the money back through the provider, record it came back another way, or close it. */
export const settleExceptionSchema = z.object({
  action: z.enum(['reverse', 'recovered', 'resolve'], { errorMap: () => ({ message: 'action must be reverse, recovered or resolve' }) }),
  note: requiredText('note', 500),
});

/** A manager records how the money of a pending reversal came back (or asks the provider again). */
export const reversalActionSchema = z.object({
  action: z.enum(['recovered', 'retry'], { errorMap: () => ({ message: 'action must be recovered or retry' }) }),
  note: z.string().trim().max(500).optional().default(''),
});
export type ReversalActionInput = z.infer<typeof reversalActionSchema>;
