import { asc, eq } from '@reelwright/db';
import { regions, shops, users } from '@reelwright/db/schema';
import { db } from '../db';

/** Everyone in the network with their role and scope; the owner's people list. */
export async function listPeople() {
  const conn = await db();
  return conn
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      active: users.active,
      shopId: users.shopId,
      shopName: shops.name,
      regionId: users.regionId,
      regionName: regions.name,
    })
    .from(users)
    .leftJoin(shops, eq(shops.id, users.shopId))
    .leftJoin(regions, eq(regions.id, users.regionId))
    .orderBy(asc(users.role), asc(users.name));
}
