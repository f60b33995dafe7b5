import { asc, eq, inArray, type Db, type Tx } from '@reelwright/db';
import {
  activityLog,
  comebacks,
  networkSettings,
  rootCauses,
  type ComebackAttribution,
} from '@reelwright/db/schema';
import type { ComebackSettingsInput } from '~/lib/validators/comebacks';
import { db } from '../db';
import { badRequest } from '../errors';
import type { Principal } from '../principal';
import * as clock from '~/server/clock';

export interface ComebackSettings {
  warrantyDays: number;
  reviewDeadlineDays: number;
  correctiveActionDueDays: number;
  countedAttributions: ComebackAttribution[];
}

export interface RootCauseRow {
  id: number;
  code: string;
  label: string;
  position: number;
  active: boolean;
  /** Comebacks that name it (a used root cause can be deactivated, not removed). */
  used: number;
}

const DEFAULTS: ComebackSettings = {
  warrantyDays: 90,
  reviewDeadlineDays: 7,
  correctiveActionDueDays: 14,
  countedAttributions: ['workmanship', 'part_failure'],
};

/** The owner's comeback settings; the schema defaults when the network has no settings row yet. */
export async function loadComebackSettings(conn: Pick<Tx, 'select'>): Promise<ComebackSettings> {
  const [row] = await conn
    .select({
      warrantyDays: networkSettings.warrantyDays,
      reviewDeadlineDays: networkSettings.reviewDeadlineDays,
      correctiveActionDueDays: networkSettings.correctiveActionDueDays,
      countedAttributions: networkSettings.countedAttributions,
    })
    .from(networkSettings)
    .where(eq(networkSettings.id, 1));
  return row ? { ...row, countedAttributions: [...row.countedAttributions] } : { ...DEFAULTS };
}

export async function listRootCauses(conn: Pick<Tx, 'select'>): Promise<RootCauseRow[]> {
  const causes = await conn
    .select()
    .from(rootCauses)
    .orderBy(asc(rootCauses.position), asc(rootCauses.id));
  const uses = await conn
    .select({ id: comebacks.rootCauseId })
    .from(comebacks)
    .where(
      inArray(
        comebacks.rootCauseId,
        causes.map((c) => c.id),
      ),
    );
  const count = new Map<number, number>();
  for (const u of uses) if (u.id !== null) count.set(u.id, (count.get(u.id) ?? 0) + 1);
  return causes.map((c) => ({
    id: c.id,
    code: c.code,
    label: c.label,
    position: c.position,
    active: c.active,
    used: count.get(c.id) ?? 0,
  }));
}

export async function comebackSettingsView(conn?: Db) {
  const c = conn ?? (await db());
  const [settings, causes] = await Promise.all([loadComebackSettings(c), listRootCauses(c)]);
  return { settings, rootCauses: causes };
}

/** A stable code from a label: "Drag stack not serviced" → "drag_stack_not_serviced". */
export function codeOf(label: string): string {
  const base = label
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 48);
  return base || 'cause';
}

/**
 * Saves the owner's comeback settings and the root cause list in one transaction: the list's order
 * is the order shown to reviewers; a root cause is renamed or deactivated but never removed (old
 * reviews name it), so leaving out an existing one is a 400. Changes are written to the activity
 * log with before and after.
 */
export async function saveComebackSettings(principal: Principal, input: ComebackSettingsInput) {
  const conn = await db();
  await conn.transaction(async (tx) => {
    const before = await loadComebackSettings(tx);
    const existing = await tx.select().from(rootCauses);
    const byId = new Map(existing.map((c) => [c.id, c]));
    const errors: { field: string; message: string }[] = [];
    input.rootCauses.forEach((c, i) => {
      if (c.id !== undefined && !byId.has(c.id))
        errors.push({ field: `body.rootCauses.${i}.id`, message: 'No such root cause' });
    });
    const kept = new Set(input.rootCauses.flatMap((c) => (c.id === undefined ? [] : [c.id])));
    const dropped = existing.filter((c) => !kept.has(c.id));
    if (dropped.length)
      errors.push({
        field: 'body.rootCauses',
        message: `Deactivate rather than remove: ${dropped.map((c) => c.label).join(', ')}`,
      });
    if (errors.length) throw badRequest('Some body fields are not valid.', errors);

    const now = clock.now();
    const after = {
      warrantyDays: input.warrantyDays,
      reviewDeadlineDays: input.reviewDeadlineDays,
      correctiveActionDueDays: input.correctiveActionDueDays,
      countedAttributions: input.countedAttributions,
    };
    const [current] = await tx
      .select({ id: networkSettings.id })
      .from(networkSettings)
      .where(eq(networkSettings.id, 1));
    if (current)
      await tx
        .update(networkSettings)
        .set({ ...after, updatedById: principal.id, updatedAt: now })
        .where(eq(networkSettings.id, 1));
    else
      await tx.insert(networkSettings).values({
        id: 1,
        networkName: 'Network',
        ...after,
        updatedById: principal.id,
        updatedAt: now,
      });
    if (JSON.stringify(before) !== JSON.stringify(after))
      await tx.insert(activityLog).values({
        at: now,
        userId: principal.id,
        action: 'settings.update',
        entityType: 'network_settings',
        entityId: 1,
        shopId: null,
        before: { ...before },
        after: { ...after },
      });

    const codes = new Set(existing.map((c) => c.code));
    for (const [position, c] of input.rootCauses.entries()) {
      const old = c.id === undefined ? undefined : byId.get(c.id);
      if (!old) {
        let code = codeOf(c.label);
        for (let n = 2; codes.has(code); n++) code = `${codeOf(c.label)}_${n}`;
        codes.add(code);
        const [created] = await tx
          .insert(rootCauses)
          .values({ code, label: c.label, position, active: c.active, createdAt: now })
          .returning();
        await tx.insert(activityLog).values({
          at: now,
          userId: principal.id,
          action: 'root_cause.create',
          entityType: 'root_cause',
          entityId: created!.id,
          shopId: null,
          before: null,
          after: { code, label: c.label, position, active: c.active },
        });
        continue;
      }
      if (old.label === c.label && old.position === position && old.active === c.active) continue;
      await tx
        .update(rootCauses)
        .set({ label: c.label, position, active: c.active })
        .where(eq(rootCauses.id, old.id));
      await tx.insert(activityLog).values({
        at: now,
        userId: principal.id,
        action: 'root_cause.update',
        entityType: 'root_cause',
        entityId: old.id,
        shopId: null,
        before: { label: old.label, position: old.position, active: old.active },
        after: { label: c.label, position, active: c.active },
      });
    }
  });
  return comebackSettingsView();
}
