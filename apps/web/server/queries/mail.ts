import { eq } from '@reelwright/db';
import { networkSettings } from '@reelwright/db/schema';
import { db } from '../db';
import { undeliveredEmails, type UndeliveredEmail } from '../mail/outbox';

/** The settings page's "Mail and reminders": the weekly run's switch and the dead messages. */
export async function mailAndReminders(): Promise<{
  weeklyReminders: boolean;
  undelivered: UndeliveredEmail[];
}> {
  const conn = await db();
  const [[settings], undelivered] = await Promise.all([
    conn
      .select({ weeklyReminders: networkSettings.weeklyReminders })
      .from(networkSettings)
      .where(eq(networkSettings.id, 1)),
    undeliveredEmails(conn),
  ]);
  return { weeklyReminders: settings?.weeklyReminders ?? true, undelivered };
}
