import type { Metadata } from 'next';
import { PageHeader, Panel } from '~/components/ui';
import { ROLE_LABELS } from '~/lib/permissions';
import { MIN_PASSWORD_LENGTH } from '~/lib/validators/people';
import { requirePagePrincipal } from '~/server/session';
import { ChangePasswordForm } from './_components/change-password-form';

export const metadata: Metadata = { title: 'Your account' };
export const dynamic = 'force-dynamic';

export default async function AccountPage() {
  const principal = await requirePagePrincipal('account:write');
  return (
    <>
      <PageHeader
        title="Your account"
        lead={`${principal.name} · ${ROLE_LABELS[principal.role]} · ${principal.email}`}
      />
      <Panel
        title="Change your password"
        description={`At least ${MIN_PASSWORD_LENGTH} characters, not one of the commonly used passwords. Afterwards every session of yours ends, this one too: sign in again with the new password.`}
      >
        <ChangePasswordForm />
      </Panel>
    </>
  );
}
