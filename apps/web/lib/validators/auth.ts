import { z } from 'zod';
import { text } from './common';

export const signInSchema = z.object({
  email: z.email('Enter the e-mail address you sign in with').trim().toLowerCase(),
  password: text().min(1, 'Enter your password').max(200),
});
export type SignInInput = z.infer<typeof signInSchema>;
