import { getServerSession } from 'next-auth';
import { redirect } from 'next/navigation';
import { cache } from 'react';
import { can, type Permission } from '~/lib/permissions';
import { authOptions, isCurrent, sessionUser } from './auth';
import { forbidden } from './errors';
import { scopeOf, type Principal } from './principal';

/**
 * The caller of this request, or null when signed out. The session only names the user and the
 * session version it was issued at; role and scope are read fresh so that a change by the owner
 * takes effect at once, and a session whose version has moved on (sign-out, a new password,
 * deactivation, a new role or scope) is signed out.
 */
export const getPrincipal = cache(async (): Promise<Principal | null> => {
  const session = await getServerSession(authOptions);
  const claims = session?.user as { id?: unknown; sessionVersion?: unknown } | undefined;
  const id = claims?.id;
  if (typeof id !== 'number') return null;
  const user = await sessionUser(id);
  if (!user || !isCurrent(user, claims?.sessionVersion)) return null;
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    role: user.role,
    shopId: user.shopId,
    regionId: user.regionId,
    scope: scopeOf(user),
  };
});

/** For pages: the caller, or a redirect to sign-in; with a permission, a 403 page when missing. */
export async function requirePagePrincipal(permission?: Permission): Promise<Principal> {
  const principal = await getPrincipal();
  if (!principal) redirect('/sign-in');
  if (permission && !can(principal.role, permission)) throw forbidden();
  return principal;
}
