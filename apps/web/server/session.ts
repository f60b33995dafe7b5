import { eq } from '@reelwright/db';
import { users } from '@reelwright/db/schema';
import { getServerSession } from 'next-auth';
import { redirect } from 'next/navigation';
import { cache } from 'react';
import { can, type Permission } from '~/lib/permissions';
import { authOptions } from './auth';
import { db } from './db';
import { forbidden } from './errors';
import { scopeOf, type Principal } from './principal';

/**
 * The caller of this request, or null when signed out. The session only names the user; role and
 * scope are read fresh so that a change by the owner takes effect at once.
 */
export const getPrincipal = cache(async (): Promise<Principal | null> => {
  const session = await getServerSession(authOptions);
  const id = (session?.user as { id?: unknown } | undefined)?.id;
  if (typeof id !== 'number') return null;
  const [user] = await (await db()).select().from(users).where(eq(users.id, id)).limit(1);
  if (!user || !user.active) return null;
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
