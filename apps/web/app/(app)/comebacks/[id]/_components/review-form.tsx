'use client';

import { useId, useState } from 'react';
import { SaveBar } from '~/components/save-bar';
import {
  ATTRIBUTION_LABELS,
  ATTRIBUTIONS,
  DISMISS_REASON_LABELS,
  DISMISS_REASONS,
  DISPOSITION_LABELS,
  DISPOSITIONS,
  type AttributionValue,
  type DismissReasonValue,
  type DispositionValue,
} from '~/lib/comebacks';
import type { ComebackPatchInput } from '~/lib/validators/comebacks';
import type { ComebackDetail } from '~/server/queries/comebacks';
import { ATTRIBUTION_HINTS, Choice, FIELD_NAMES, FieldError, input } from './review-fields';
import { fieldErrors, useComebackMutation } from './use-comeback-mutation';

/** The review: confirm or dismiss, then attribution, root cause, step, disposition and follow-up. */
export function ReviewForm({ comeback: c }: { comeback: ComebackDetail }) {
  const uid = useId();
  const f = (name: string) => `${uid}-${name}`;
  const save = useComebackMutation(c.id);
  const [decision, setDecision] = useState<'confirmed' | 'dismissed' | ''>(
    c.status === 'open' ? '' : c.status,
  );
  const [attribution, setAttribution] = useState<AttributionValue | ''>(c.attribution ?? '');
  const [rootCauseId, setRootCauseId] = useState(c.rootCauseId ? String(c.rootCauseId) : '');
  const [rootCauseNote, setRootCauseNote] = useState(c.rootCauseNote ?? '');
  const [stepId, setStepId] = useState(c.checklistStepId ? String(c.checklistStepId) : '');
  const [disposition, setDisposition] = useState<DispositionValue | ''>(c.disposition ?? '');
  const [reason, setReason] = useState<DismissReasonValue | ''>(c.dismissal.reason ?? '');
  const [note, setNote] = useState(c.dismissal.note ?? '');
  const hasAction = c.correctiveActions.length > 0;
  const [openAction, setOpenAction] = useState(false);
  const lead = c.actionOwners.find((p) => p.role === 'shop_lead');
  const [actionTitle, setActionTitle] = useState(
    `Comeback #${c.id}: stop this fault recurring at ${c.originalJob.shopName}`,
  );
  const [actionOwner, setActionOwner] = useState(lead ? String(lead.id) : '');
  const [actionDue, setActionDue] = useState(c.settings.defaultDueOn);
  const [actionText, setActionText] = useState('');
  const [local, setLocal] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);

  const server = fieldErrors(save.error);
  const errors = { ...server, ...local };
  /** A field's message goes as soon as the field is changed. */
  const fix = (...keys: string[]) => {
    setSaved(false);
    if (keys.some((k) => local[k]))
      setLocal((l) => Object.fromEntries(Object.entries(l).filter(([k]) => !keys.includes(k))));
    if (keys.some((k) => server[k])) save.reset();
  };
  const err = (k: string) => errors[k];
  const invalid = (k: string) => (err(k) ? true : undefined);
  const describedBy = (k: string, hint?: string) =>
    [hint, err(k) ? f(`${k}-error`) : undefined].filter(Boolean).join(' ') || undefined;

  const body = (): ComebackPatchInput | null => {
    if (decision === 'dismissed')
      return {
        status: 'dismissed',
        dismissReason: reason || undefined,
        dismissNote: note.trim() || null,
      };
    if (decision === 'confirmed')
      return {
        status: 'confirmed',
        attribution: attribution || null,
        rootCauseId: rootCauseId ? Number(rootCauseId) : null,
        rootCauseNote: rootCauseNote.trim() || null,
        checklistStepId: stepId ? Number(stepId) : null,
        disposition: disposition || null,
        ...(openAction && !hasAction
          ? {
              correctiveAction: {
                title: actionTitle,
                description: actionText.trim() || null,
                ownerId: actionOwner ? Number(actionOwner) : (undefined as unknown as number),
                dueOn: actionDue,
              },
            }
          : {}),
      };
    return null;
  };

  const submit = async () => {
    setSaved(false);
    const patch = body();
    if (!patch) {
      setLocal({ status: 'Choose whether to confirm or dismiss the comeback' });
      return;
    }
    // The request schema (and zod with it) loads on the first submit, not with the page.
    const { comebackPatch } = await import('~/lib/validators/comebacks');
    const parsed = comebackPatch.safeParse(patch);
    if (!parsed.success) {
      const next: Record<string, string> = {};
      for (const issue of parsed.error.issues) next[issue.path.join('.')] ??= issue.message;
      setLocal(next);
      return;
    }
    setLocal({});
    save.mutate(patch, { onSuccess: () => setSaved(true) });
  };

  const summary = Object.entries(errors);
  return (
    <section
      aria-labelledby={f('title')}
      className="rounded-lg border border-sand-200 bg-white shadow-sm"
    >
      <div className="border-b border-sand-200 px-5 py-4">
        <h2 id={f('title')} className="text-lg font-semibold text-slate-900">
          Review
        </h2>
        <p className="mt-1 text-slate-600">
          Confirm it when the reel came back for a fault the service should have prevented; the
          attribution decides whether it counts in {c.originalJob.shopName}&apos;s comeback rate (
          {c.settings.countedAttributions
            .map((a) => ATTRIBUTION_LABELS[a].toLowerCase())
            .join(' or ')}{' '}
          count).
        </p>
      </div>
      <form
        noValidate
        className="space-y-6 p-5"
        onSubmit={(e) => {
          e.preventDefault();
          void submit();
        }}
      >
        {summary.length > 0 && (
          <div role="alert" className="rounded-md border border-brick-300 bg-brick-50 p-4">
            <p className="font-semibold text-brick-800">The review was not saved:</p>
            <ul className="mt-1 list-disc pl-5 text-brick-800">
              {summary.map(([k, m]) => (
                <li key={k}>
                  {FIELD_NAMES[k] ? `${FIELD_NAMES[k]}: ` : ''}
                  {m}
                </li>
              ))}
            </ul>
          </div>
        )}
        {save.isError && summary.length === 0 && (
          <p role="alert" className="font-medium text-brick-700">
            Not saved: {save.error.message}
          </p>
        )}

        <fieldset aria-describedby={err('status') ? f('status-error') : undefined}>
          <legend className="font-semibold text-slate-900">Decision</legend>
          <div className="mt-2 grid gap-2 sm:grid-cols-2">
            <Choice
              name={f('decision')}
              checked={decision === 'confirmed'}
              onChange={() => {
                setDecision('confirmed');
                fix('status', 'dismissReason');
              }}
            >
              <span className="block font-medium">Confirm the comeback</span>
              <span className="block text-sm text-slate-700">
                The reel came back for the same fault
              </span>
            </Choice>
            <Choice
              name={f('decision')}
              checked={decision === 'dismissed'}
              onChange={() => {
                setDecision('dismissed');
                fix('status', 'attribution', 'correctiveAction');
              }}
            >
              <span className="block font-medium">Dismiss it</span>
              <span className="block text-sm text-slate-700">It is not a comeback of our work</span>
            </Choice>
          </div>
          <FieldError id={f('status-error')} message={err('status')} />
        </fieldset>

        {decision === 'dismissed' && (
          <>
            <fieldset
              aria-describedby={err('dismissReason') ? f('dismissReason-error') : undefined}
            >
              <legend className="font-semibold text-slate-900">Why it is dismissed</legend>
              <div className="mt-2 grid gap-2 sm:grid-cols-3">
                {DISMISS_REASONS.map((r) => (
                  <Choice
                    key={r}
                    name={f('reason')}
                    checked={reason === r}
                    onChange={() => {
                      setReason(r);
                      fix('dismissReason');
                    }}
                  >
                    {DISMISS_REASON_LABELS[r]}
                  </Choice>
                ))}
              </div>
              <FieldError id={f('dismissReason-error')} message={err('dismissReason')} />
            </fieldset>
            <div>
              <label htmlFor={f('note')} className="block font-medium text-slate-800">
                Note (optional)
              </label>
              <textarea
                id={f('note')}
                rows={2}
                value={note}
                onChange={(e) => {
                  setNote(e.target.value);
                  fix('dismissNote');
                }}
                aria-invalid={invalid('dismissNote')}
                aria-describedby={describedBy('dismissNote')}
                className={`${input} py-2`}
              />
              <FieldError id={f('dismissNote-error')} message={err('dismissNote')} />
            </div>
          </>
        )}

        {decision === 'confirmed' && (
          <>
            <fieldset aria-describedby={err('attribution') ? f('attribution-error') : undefined}>
              <legend className="font-semibold text-slate-900">Attribution</legend>
              <div className="mt-2 grid gap-2 sm:grid-cols-2">
                {ATTRIBUTIONS.map((a) => (
                  <Choice
                    key={a}
                    name={f('attribution')}
                    checked={attribution === a}
                    onChange={() => {
                      setAttribution(a);
                      fix('attribution');
                    }}
                  >
                    <span className="block font-medium">
                      {ATTRIBUTION_LABELS[a]}
                      {c.settings.countedAttributions.includes(a) && (
                        <span className="ml-2 text-sm font-normal text-brick-800">
                          (counts in the rate)
                        </span>
                      )}
                    </span>
                    <span className="block text-sm text-slate-700">{ATTRIBUTION_HINTS[a]}</span>
                  </Choice>
                ))}
              </div>
              <FieldError id={f('attribution-error')} message={err('attribution')} />
            </fieldset>

            <div className="grid gap-4 md:grid-cols-2">
              <div>
                <label htmlFor={f('cause')} className="block font-medium text-slate-800">
                  Root cause
                </label>
                <select
                  id={f('cause')}
                  value={rootCauseId}
                  onChange={(e) => {
                    setRootCauseId(e.target.value);
                    fix('rootCauseId');
                  }}
                  aria-invalid={invalid('rootCauseId')}
                  aria-describedby={describedBy('rootCauseId')}
                  className={input}
                >
                  <option value="">Not decided yet</option>
                  {c.rootCauses.map((r) => (
                    <option key={r.id} value={r.id}>
                      {r.label}
                      {r.active ? '' : ' (no longer listed)'}
                    </option>
                  ))}
                </select>
                <FieldError id={f('rootCauseId-error')} message={err('rootCauseId')} />
              </div>
              <div>
                <label htmlFor={f('step')} className="block font-medium text-slate-800">
                  Checklist step it traces to (optional)
                </label>
                <select
                  id={f('step')}
                  value={stepId}
                  onChange={(e) => {
                    setStepId(e.target.value);
                    fix('checklistStepId');
                  }}
                  aria-invalid={invalid('checklistStepId')}
                  aria-describedby={describedBy('checklistStepId')}
                  className={input}
                >
                  <option value="">None</option>
                  {c.steps.map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.title}
                      {s.ticked ? '' : ' (not ticked on the original job)'}
                    </option>
                  ))}
                </select>
                <FieldError id={f('checklistStepId-error')} message={err('checklistStepId')} />
              </div>
            </div>
            <div>
              <label htmlFor={f('cause-note')} className="block font-medium text-slate-800">
                What was found (optional)
              </label>
              <textarea
                id={f('cause-note')}
                rows={2}
                value={rootCauseNote}
                onChange={(e) => {
                  setRootCauseNote(e.target.value);
                  fix('rootCauseNote');
                }}
                aria-invalid={invalid('rootCauseNote')}
                aria-describedby={describedBy('rootCauseNote')}
                className={`${input} py-2`}
              />
              <FieldError id={f('rootCauseNote-error')} message={err('rootCauseNote')} />
            </div>

            <fieldset aria-describedby={err('disposition') ? f('disposition-error') : undefined}>
              <legend className="font-semibold text-slate-900">Disposition</legend>
              <div className="mt-2 grid gap-2 sm:grid-cols-3">
                {DISPOSITIONS.map((d) => (
                  <Choice
                    key={d}
                    name={f('disposition')}
                    checked={disposition === d}
                    onChange={() => {
                      setDisposition(d);
                      fix('disposition');
                    }}
                  >
                    {DISPOSITION_LABELS[d]}
                  </Choice>
                ))}
              </div>
              <FieldError id={f('disposition-error')} message={err('disposition')} />
            </fieldset>

            {!hasAction && c.canOpenAction && (
              <div className="rounded-md border border-sand-200 bg-sand-50 p-4">
                <label className="flex min-h-11 items-center gap-3 font-medium text-slate-900">
                  <input
                    type="checkbox"
                    checked={openAction}
                    onChange={(e) => {
                      setOpenAction(e.target.checked);
                      fix('correctiveAction');
                    }}
                    className="size-5 accent-sea-700"
                  />
                  Open a corrective action
                </label>
                {openAction && (
                  <div className="mt-3 grid gap-4 md:grid-cols-2">
                    <div className="md:col-span-2">
                      <label htmlFor={f('action-title')} className="block font-medium">
                        Title
                      </label>
                      <input
                        id={f('action-title')}
                        value={actionTitle}
                        onChange={(e) => {
                          setActionTitle(e.target.value);
                          fix('correctiveAction.title');
                        }}
                        aria-invalid={invalid('correctiveAction.title')}
                        aria-describedby={describedBy('correctiveAction.title')}
                        className={input}
                      />
                      <FieldError
                        id={f('correctiveAction.title-error')}
                        message={err('correctiveAction.title')}
                      />
                    </div>
                    <div>
                      <label htmlFor={f('action-owner')} className="block font-medium">
                        Owner
                      </label>
                      <select
                        id={f('action-owner')}
                        value={actionOwner}
                        onChange={(e) => {
                          setActionOwner(e.target.value);
                          fix('correctiveAction.ownerId');
                        }}
                        aria-invalid={invalid('correctiveAction.ownerId')}
                        aria-describedby={describedBy('correctiveAction.ownerId')}
                        className={input}
                      >
                        <option value="">Choose a person</option>
                        {c.actionOwners.map((p) => (
                          <option key={p.id} value={p.id}>
                            {p.name} ({p.role === 'shop_lead' ? 'shop lead' : 'technician'})
                          </option>
                        ))}
                      </select>
                      <FieldError
                        id={f('correctiveAction.ownerId-error')}
                        message={err('correctiveAction.ownerId')}
                      />
                    </div>
                    <div>
                      <label htmlFor={f('action-due')} className="block font-medium">
                        Due date
                      </label>
                      <input
                        id={f('action-due')}
                        type="date"
                        value={actionDue}
                        onChange={(e) => {
                          setActionDue(e.target.value);
                          fix('correctiveAction.dueOn');
                        }}
                        aria-invalid={invalid('correctiveAction.dueOn')}
                        aria-describedby={describedBy(
                          'correctiveAction.dueOn',
                          f('action-due-hint'),
                        )}
                        className={input}
                      />
                      <p id={f('action-due-hint')} className="mt-1 text-sm text-slate-600">
                        {c.settings.correctiveActionDueDays} days from today unless you change it.
                      </p>
                      <FieldError
                        id={f('correctiveAction.dueOn-error')}
                        message={err('correctiveAction.dueOn')}
                      />
                    </div>
                    <div className="md:col-span-2">
                      <label htmlFor={f('action-text')} className="block font-medium">
                        What must change (optional)
                      </label>
                      <textarea
                        id={f('action-text')}
                        rows={2}
                        value={actionText}
                        onChange={(e) => setActionText(e.target.value)}
                        className={`${input} py-2`}
                      />
                    </div>
                  </div>
                )}
              </div>
            )}
          </>
        )}

        <SaveBar
          label="Save the review"
          pending={save.isPending}
          done={saved && !save.isPending && !save.isError ? 'Review saved.' : ''}
          className="border-t border-sand-200 pt-5"
        />
      </form>
    </section>
  );
}
