import { and, asc, eq } from '@reelwright/db';
import { networkSettings, shops, users } from '@reelwright/db/schema';
import type { InspectionLevelValue } from '~/lib/validators/audits';
import { db } from '../../db';
import type { Principal } from '../../principal';
import { shopScope } from '../scope';
import { currentForm } from './forms';

/** What the planning screen offers: the caller's shops, the auditors and the owner's defaults. */
export async function planningOptions(principal: Principal) {
  const conn = await db();
  const [shopRows, auditors, settings, form] = await Promise.all([
    conn
      .select({ id: shops.id, name: shops.name, timeZone: shops.timeZone })
      .from(shops)
      .where(and(shopScope(principal), eq(shops.active, true)))
      .orderBy(asc(shops.name)),
    conn
      .select({ id: users.id, name: users.name, email: users.email })
      .from(users)
      .where(and(eq(users.role, 'auditor'), eq(users.active, true)))
      .orderBy(asc(users.name)),
    conn
      .select({
        defaultAql: networkSettings.defaultAql,
        defaultInspectionLevel: networkSettings.defaultInspectionLevel,
      })
      .from(networkSettings)
      .limit(1),
    currentForm(),
  ]);
  return {
    shops: shopRows,
    auditors,
    defaults: {
      aql: settings[0]?.defaultAql ?? 2.5,
      level: (settings[0]?.defaultInspectionLevel ?? 'II') as InspectionLevelValue,
    },
    form: form ? { id: form.id, version: form.version, title: form.title } : null,
  };
}
