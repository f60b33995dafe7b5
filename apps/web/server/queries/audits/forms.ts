import { asc, desc, eq, isNotNull, sql } from '@reelwright/db';
import { auditFormItems, auditForms, auditRounds, networkSettings } from '@reelwright/db/schema';
import { db } from '../../db';

export interface FormItemView {
  id: number;
  position: number;
  code: string;
  title: string;
  guidance: string | null;
  weight: number;
  critical: boolean;
}

/** The items of one audit form version, in order. */
export async function formItems(formId: number): Promise<FormItemView[]> {
  const conn = await db();
  return conn
    .select({
      id: auditFormItems.id,
      position: auditFormItems.position,
      code: auditFormItems.code,
      title: auditFormItems.title,
      guidance: auditFormItems.guidance,
      weight: auditFormItems.weight,
      critical: auditFormItems.critical,
    })
    .from(auditFormItems)
    .where(eq(auditFormItems.formId, formId))
    .orderBy(asc(auditFormItems.position), asc(auditFormItems.id));
}

/** The network's audit pass mark (85 when the owner has not set one). */
export async function passMark(): Promise<number> {
  const conn = await db();
  const [row] = await conn
    .select({ passMark: networkSettings.auditPassMark })
    .from(networkSettings)
    .limit(1);
  return row?.passMark ?? 85;
}

/** The latest published version of the audit form with its items. */
export async function currentForm() {
  const conn = await db();
  const [form] = await conn
    .select()
    .from(auditForms)
    .where(isNotNull(auditForms.publishedAt))
    .orderBy(desc(auditForms.version))
    .limit(1);
  if (!form) return null;
  return { ...form, items: await formItems(form.id) };
}

/** Every version of the audit form, newest first, with how many rounds use each. */
export async function formVersions() {
  const conn = await db();
  return conn
    .select({
      id: auditForms.id,
      version: auditForms.version,
      title: auditForms.title,
      publishedAt: auditForms.publishedAt,
      items:
        sql<number>`(select count(*) from ${auditFormItems} i where i.form_id = ${auditForms}.id)`.mapWith(
          Number,
        ),
      rounds:
        sql<number>`(select count(*) from ${auditRounds} r where r.form_id = ${auditForms}.id)`.mapWith(
          Number,
        ),
    })
    .from(auditForms)
    .orderBy(desc(auditForms.version));
}
