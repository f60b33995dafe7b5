import { z } from 'zod';

/** `GET /api/dev/mail?to=`: only what went to this address. */
export const caughtMailQuery = z.object({ to: z.email('Give an e-mail address').optional() });
