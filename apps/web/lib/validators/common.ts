import { z } from 'zod';

export const idParam = z.coerce
  .number({ error: 'Must be a number' })
  .int('Must be a whole number')
  .positive('Must be positive')
  .max(2_147_483_647, 'Too large');

export const idParams = z.object({ id: idParam });
