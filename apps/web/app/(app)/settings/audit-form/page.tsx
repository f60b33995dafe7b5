import type { Metadata } from 'next';
import Link from 'next/link';
import { NotAllowed, PageHeader, Panel } from '~/components/ui';
import { can } from '~/lib/permissions';
import { currentForm, formVersions } from '~/server/queries/audits';
import { requirePagePrincipal } from '~/server/session';
import { AuditFormEditor } from './_components/audit-form-editor';

export const metadata: Metadata = { title: 'Audit form' };
export const dynamic = 'force-dynamic';

export default async function AuditFormSettingsPage() {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'settings:manage')) return <NotAllowed />;
  const [form, versions] = await Promise.all([currentForm(), formVersions()]);
  return (
    <>
      <p className="mb-2">
        <Link href="/settings" className="text-sea-700 underline underline-offset-2">
          ← Settings
        </Link>
      </p>
      <PageHeader
        title="Audit form"
        lead="What auditors score each sampled job against. Publishing makes a new version for rounds planned from now on; rounds already planned or scored keep the version they were planned with."
      />
      <div className="grid gap-8 xl:grid-cols-[minmax(0,1fr)_20rem]">
        <Panel
          title={form ? `Next version (${form.version + 1})` : 'First version'}
          description="Starts from the current version. Weights count towards the 0–100 score; a failed critical item makes the verdict a critical miss whatever the score."
        >
          <AuditFormEditor
            initial={{
              title: form
                ? form.title.replace(/version \d+$/i, `version ${form.version + 1}`)
                : 'Job audit form, version 1',
              items: (form?.items ?? []).map((i) => ({
                code: i.code,
                title: i.title,
                guidance: i.guidance ?? '',
                weight: i.weight,
                critical: i.critical,
              })),
            }}
          />
        </Panel>
        <Panel title="Versions">
          <ol className="space-y-3">
            {versions.map((v) => (
              <li key={v.id}>
                <p className="font-medium">
                  Version {v.version}
                  {form?.id === v.id && (
                    <span className="ml-2 text-sm text-sea-800">(current)</span>
                  )}
                </p>
                <p className="text-sm text-slate-700">
                  {v.title} · {v.items} items · used by {v.rounds}{' '}
                  {v.rounds === 1 ? 'round' : 'rounds'}
                </p>
              </li>
            ))}
          </ol>
        </Panel>
      </div>
    </>
  );
}
