import { redirect } from 'next/navigation';
import { can } from '~/lib/permissions';
import { requirePagePrincipal } from '~/server/session';

export const dynamic = 'force-dynamic';

// The shops side by side now live in the Network section; a shop's own people go to their shop.
export default async function ShopsPage() {
  const principal = await requirePagePrincipal();
  if (principal.scope.kind === 'shop') redirect(`/shops/${principal.scope.shopId}`);
  // An auditor sees shops only through their audit rounds.
  if (!can(principal.role, 'network:read')) redirect('/audits');
  redirect('/network');
}
