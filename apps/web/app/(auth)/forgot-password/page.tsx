import type { Metadata } from 'next';
import { AuthCard } from '../_components/auth-card';
import { ForgotPasswordForm } from './_components/forgot-password-form';

export const metadata: Metadata = { title: 'Forgot your password?' };

export default function ForgotPasswordPage() {
  return (
    <AuthCard
      title="Forgot your password?"
      lead="Give the e-mail address you sign in with. We send a link to choose a new password; it works once, for an hour."
    >
      <ForgotPasswordForm />
    </AuthCard>
  );
}
