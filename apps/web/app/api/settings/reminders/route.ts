// GET, PUT /api/settings/reminders – whether each shop's service reminders go out by themselves on Monday morning (owner)
import { eq } from '@reelwright/db';
import { activityLog, networkSettings } from '@reelwright/db/schema';
import { reminderSettingsInput } from '~/lib/validators/mail';
import { route } from '~/server/api';
import * as clock from '~/server/clock';
import { db } from '~/server/db';
import { otherMethods } from '~/server/method-not-allowed';

export const GET = route({ permission: 'settings:manage' }, async () => {
  const [row] = await (
    await db()
  )
    .select({ weeklyReminders: networkSettings.weeklyReminders })
    .from(networkSettings)
    .where(eq(networkSettings.id, 1));
  return { weeklyReminders: row?.weeklyReminders ?? true };
});

export const PUT = route(
  { permission: 'settings:manage', body: reminderSettingsInput },
  async ({ principal, body }) => {
    const conn = await db();
    await conn.transaction(async (tx) => {
      await tx
        .update(networkSettings)
        .set({ weeklyReminders: body.weeklyReminders, updatedById: principal.id })
        .where(eq(networkSettings.id, 1));
      await tx.insert(activityLog).values({
        at: clock.now(),
        userId: principal.id,
        action: 'settings.reminders',
        entityType: 'network_settings',
        entityId: 1,
        after: { weeklyReminders: body.weeklyReminders },
      });
    });
    return { weeklyReminders: body.weeklyReminders };
  },
);

export const { DELETE, PATCH, POST, OPTIONS } = otherMethods(['GET', 'PUT']);
