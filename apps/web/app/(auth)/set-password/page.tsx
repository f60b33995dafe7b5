import type { Metadata } from 'next';
import Link from 'next/link';
import { linkToken, MIN_PASSWORD_LENGTH } from '~/lib/validators/people';
import { describeLink } from '~/server/people';
import { AuthCard } from '../_components/auth-card';
import { SetPasswordForm } from './_components/set-password-form';

export const metadata: Metadata = { title: 'Choose a password', referrer: 'no-referrer' };
export const dynamic = 'force-dynamic';

export default async function SetPasswordPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { token } = await searchParams;
  const parsed = linkToken.safeParse(token);
  const link = parsed.success ? await describeLink(parsed.data) : null;
  if (!parsed.success || !link)
    return (
      <AuthCard
        title="This link no longer works"
        lead="It has been used, withdrawn or has expired. Ask for a new one."
      >
        <p className="mt-8 space-x-4">
          <Link
            href="/forgot-password"
            className="font-medium text-sea-700 underline underline-offset-2"
          >
            Ask for a new link
          </Link>
          <Link href="/sign-in" className="font-medium text-sea-700 underline underline-offset-2">
            Sign in
          </Link>
        </p>
      </AuthCard>
    );
  return (
    <AuthCard
      title={link.purpose === 'invitation' ? `Welcome, ${link.name}` : 'Choose a new password'}
      lead={`For ${link.email}. Use at least ${MIN_PASSWORD_LENGTH} characters; a few unrelated words are easy to remember and hard to guess.`}
    >
      <SetPasswordForm token={parsed.data} />
    </AuthCard>
  );
}
