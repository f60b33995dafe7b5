'use client';

import { REEL_KIND_LABELS } from '~/lib/labels';
import { REEL_KINDS } from '~/lib/jobs';
import { formatCivilDate, USE_LABELS, WATER_LABELS } from '../../_components/format';
import {
  Choice,
  ChoiceFieldset,
  ChoiceRow,
  Field,
  inputClass,
  Section,
  TextField,
} from './check-in-fields';
import type { CheckInState } from './use-check-in';

const REEL_TEXT_FIELDS = [
  { key: 'maker', label: 'Maker' },
  { key: 'model', label: 'Model' },
  { key: 'size', label: 'Size (optional)', hint: 'As printed, e.g. 4000 or 30W' },
  { key: 'bearingCount', label: 'Bearings (optional)', inputMode: 'numeric' },
  { key: 'gearRatio', label: 'Gear ratio (optional)', hint: 'As printed, e.g. 6.2:1' },
  {
    key: 'serialNumber',
    label: 'Serial number (optional)',
    hint: 'As printed on the reel; it lets any shop of the network recognise a return',
  },
] as const;

/** Step 2, once the customer is known: one of their reels, or a new one described here. */
export function ReelSection({ form }: { form: CheckInState }) {
  const existing = form.chosen !== null && form.chosen !== 'new' ? form.chosen : null;
  return (
    <Section title="2. Reel" id="ci-section-reel">
      <p className="rounded-md border border-amber-300 bg-amber-50 px-4 py-3 text-amber-950">
        <span className="font-semibold">Caution: </span>
        reels often come in with hooks or lures still tied on. Remove and cap them before you handle
        the reel, and cut line away from your body.
      </p>
      {existing && existing.reels.length > 0 && (
        <ChoiceFieldset
          path="reel"
          legend="Which reel?"
          error={form.errors.reel}
          columns="md:grid-cols-2"
        >
          {existing.reels.map((r) => (
            <Choice
              key={r.id}
              name="reel"
              checked={form.reelChoice === r.id}
              onChange={() => form.pickReel(r.id)}
            >
              <span className="block font-semibold">
                {r.maker} {r.model} {r.size}
              </span>
              <span className="block text-sm text-slate-700">
                {REEL_KIND_LABELS[r.kind as keyof typeof REEL_KIND_LABELS]} ·{' '}
                {WATER_LABELS[r.water]} · {USE_LABELS[r.useProfile]}
                {r.lastServicedOn ? ` · last serviced ${formatCivilDate(r.lastServicedOn)}` : ''}
              </span>
            </Choice>
          ))}
          <Choice
            name="reel"
            checked={form.reelChoice === 'new'}
            onChange={() => form.pickReel('new')}
          >
            <span className="block font-semibold">Another reel</span>
            <span className="block text-sm text-slate-700">Add it below</span>
          </Choice>
        </ChoiceFieldset>
      )}
      {form.reelChoice === 'new' && (
        <div className={`grid gap-4 md:grid-cols-3 ${existing?.reels.length ? 'mt-6' : ''}`}>
          <Field path="reel.kind" label="Kind" error={form.errors['reel.kind']}>
            {(c) => (
              <select
                id={c.id}
                value={form.reel.kind}
                onChange={(e) => form.editReel('kind', e.target.value)}
                aria-invalid={c.invalid}
                aria-describedby={c.describedBy}
                className={inputClass}
              >
                <option value="">Choose…</option>
                {REEL_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {REEL_KIND_LABELS[k]}
                  </option>
                ))}
              </select>
            )}
          </Field>
          {REEL_TEXT_FIELDS.map(({ key, ...field }) => (
            <TextField key={key} {...field} {...form.reelField(key)} />
          ))}
          <ChoiceRow
            name="useProfile"
            legend="Use"
            options={['light', 'heavy'] as const}
            labels={USE_LABELS}
            value={form.reel.useProfile}
            onChange={(u) => form.editReel('useProfile', u)}
          />
          <ChoiceRow
            name="water"
            legend="Water"
            options={['salt', 'fresh'] as const}
            labels={WATER_LABELS}
            value={form.reel.water}
            onChange={(w) => form.editReel('water', w)}
          />
        </div>
      )}
    </Section>
  );
}
