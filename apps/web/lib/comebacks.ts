// The comeback screens' closed sets, labels and dismissal wording, free of zod, so that pages in
// the browser can use them; lib/validators/comebacks.ts builds the request schemas from them.

export const COMEBACK_STATUSES = ['open', 'confirmed', 'dismissed'] as const;
export type ComebackStatusValue = (typeof COMEBACK_STATUSES)[number];
export const ATTRIBUTIONS = [
  'workmanship',
  'part_failure',
  'customer_damage',
  'unrelated',
  'undetermined',
] as const;
export type AttributionValue = (typeof ATTRIBUTIONS)[number];
export const DISPOSITIONS = ['redone_free', 'charged', 'refunded'] as const;
export type DispositionValue = (typeof DISPOSITIONS)[number];
export const DISMISS_REASONS = ['not_same_fault', 'outside_window', 'not_our_work'] as const;
export type DismissReasonValue = (typeof DISMISS_REASONS)[number];

export const ATTRIBUTION_LABELS: Record<AttributionValue, string> = {
  workmanship: 'Workmanship',
  part_failure: 'Part failure',
  customer_damage: 'Customer damage',
  unrelated: 'Unrelated',
  undetermined: 'Undetermined',
};
export const DISPOSITION_LABELS: Record<DispositionValue, string> = {
  redone_free: 'Redone at no charge',
  charged: 'Charged',
  refunded: 'Refunded',
};
export const DISMISS_REASON_LABELS: Record<DismissReasonValue, string> = {
  not_same_fault: 'Not the same fault',
  outside_window: 'Outside the warranty window',
  not_our_work: 'Not our work',
};
export const COMEBACK_STATUS_LABELS: Record<ComebackStatusValue, string> = {
  open: 'To review',
  confirmed: 'Confirmed',
  dismissed: 'Dismissed',
};

/**
 * The stored dismissal text: the reason's words, then the note ("Not our work: opened elsewhere").
 * The demo seed writes the same shape, so the reason is read back from the start of the text.
 */
export function dismissalText(reason: DismissReasonValue, note?: string | null) {
  const words = DISMISS_REASON_LABELS[reason];
  return note ? `${words}: ${note}` : `${words}.`;
}

export function parseDismissal(text: string | null): {
  reason: DismissReasonValue | null;
  note: string | null;
} {
  if (!text) return { reason: null, note: null };
  for (const reason of DISMISS_REASONS) {
    const words = DISMISS_REASON_LABELS[reason];
    if (text.startsWith(words)) {
      const rest = text
        .slice(words.length)
        .replace(/^[:.]\s*/, '')
        .trim();
      return { reason, note: rest || null };
    }
  }
  return { reason: null, note: text };
}
