import { env } from '~/env';

// Plain messages for audit rounds; links are absolute when the app knows its public URL.

const link = (path: string) => (env.NEXTAUTH_URL ? new URL(path, env.NEXTAUTH_URL).href : path);

const longDate = (date: string) =>
  new Date(`${date}T12:00:00Z`).toLocaleDateString('en-GB', {
    day: 'numeric',
    month: 'long',
    year: 'numeric',
    timeZone: 'UTC',
  });

export const period = (from: string, to: string) =>
  from === to ? longDate(from) : `${longDate(from)} to ${longDate(to)}`;

export function auditAssignedEmail(input: {
  auditorName: string;
  plannerName: string;
  shopName: string;
  roundId: number;
  from: string;
  to: string;
  sampleSize: number;
}) {
  const subject = `Audit round #${input.roundId}: ${input.sampleSize} jobs at ${input.shopName} to score`;
  const text = [
    `Hello ${input.auditorName},`,
    '',
    `${input.plannerName} has assigned you audit round #${input.roundId} for ${input.shopName}: ` +
      `${input.sampleSize} ${input.sampleSize === 1 ? 'job' : 'jobs'} that became ready from ${period(input.from, input.to)}, drawn at random.`,
    '',
    `Score them against the audit form from the job record and photos: ${link(`/audits/${input.roundId}`)}`,
    'You can save part-way and finish later.',
    '',
    '— Reelwright',
  ].join('\n');
  return { subject, text };
}

export function auditRejectedEmail(input: {
  recipientName: string;
  shopName: string;
  roundId: number;
  from: string;
  to: string;
  failures: number;
  sampleSize: number;
  reject: number;
  correctiveActionId: number;
  dueOn: string;
  ownerName: string | null;
}) {
  const subject = `Audit round #${input.roundId} at ${input.shopName}: lot rejected`;
  const text = [
    `Hello ${input.recipientName},`,
    '',
    `Audit round #${input.roundId} for ${input.shopName} (jobs ready ${period(input.from, input.to)}) is decided: ` +
      `${input.failures} of ${input.sampleSize} sampled jobs fell short of the standard, which reaches the reject number ${input.reject}. The lot is rejected.`,
    '',
    `Corrective action #${input.correctiveActionId} is open for ${input.ownerName ?? 'the shop lead'}, due ${longDate(input.dueOn)}: ${link('/corrective-actions')}`,
    `The round's report: ${link(`/audits/${input.roundId}/report`)}`,
    '',
    '— Reelwright',
  ].join('\n');
  return { subject, text };
}
