import { desc } from '@reelwright/db';
import { activityLog, auditFormItems, auditForms } from '@reelwright/db/schema';
import type { AuditFormInput } from '~/lib/validators/audits';
import { db } from '../db';
import type { Principal } from '../principal';
import * as clock from '~/server/clock';

/**
 * Publishes the next version of the audit form. Versions are never edited: rounds keep the
 * version they were planned with, so a new version changes no audit already planned or scored.
 */
export async function publishAuditForm(principal: Principal, input: AuditFormInput) {
  const conn = await db();
  return conn.transaction(async (tx) => {
    // Serialises two owners publishing at once: the unique version number would refuse one.
    const [latest] = await tx
      .select({ version: auditForms.version })
      .from(auditForms)
      .orderBy(desc(auditForms.version))
      .limit(1)
      .for('update');
    const now = clock.now();
    const [form] = await tx
      .insert(auditForms)
      .values({
        version: (latest?.version ?? 0) + 1,
        title: input.title,
        publishedAt: now,
        createdById: principal.id,
      })
      .returning();
    if (!form) throw new Error('publishAuditForm: insert returned no row');
    const items = await tx
      .insert(auditFormItems)
      .values(
        input.items.map((item, i) => ({
          formId: form.id,
          position: i + 1,
          code: item.code,
          title: item.title,
          guidance: item.guidance || null,
          weight: item.weight,
          critical: item.critical,
        })),
      )
      .returning();
    await tx.insert(activityLog).values({
      at: now,
      userId: principal.id,
      action: 'audit_form.publish',
      entityType: 'audit_form',
      entityId: form.id,
      shopId: null,
      before: latest ? { version: latest.version } : null,
      after: { version: form.version, title: form.title, items: items.length },
    });
    return { ...form, items };
  });
}
