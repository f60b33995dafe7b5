import { env } from '~/env';

/** The app's public address for links in e-mail: APP_BASE_URL, else NEXTAUTH_URL. */
export const appBaseUrl = () => env.APP_BASE_URL ?? env.NEXTAUTH_URL ?? null;

/** An absolute link when the app knows its public address, else the path. */
export function appLink(path: string, baseUrl = appBaseUrl()) {
  return baseUrl ? new URL(path, baseUrl).href : path;
}

const days = (n: number) => (n === 1 ? '1 day' : `${n} days`);

/** To the original shop's lead (or the person a review is assigned to): a comeback to review. */
export function comebackReviewEmail(input: {
  recipientName: string;
  comebackId: number;
  originalShopName: string;
  returnShopName: string;
  returnJobId: number;
  originalJobId: number;
  reel: string;
  customerName: string;
  daysSinceCollection: number;
  symptom: string | null;
  detection: 'automatic' | 'manual';
  reviewDeadlineDays: number;
  /** Set when a manager hands the review on. */
  assignedBy?: string;
  baseUrl?: string | null;
}) {
  const where =
    input.returnShopName === input.originalShopName
      ? `to ${input.originalShopName}`
      : `to ${input.returnShopName} (your shop ${input.originalShopName} did the work)`;
  const subject = `Comeback to review: ${input.reel} back after ${days(input.daysSinceCollection)} (job #${input.returnJobId})`;
  const how =
    input.detection === 'automatic'
      ? 'It was flagged at check-in because it came back inside the warranty window.'
      : 'A technician linked it to the earlier job by hand.';
  const text = [
    `Hello ${input.recipientName},`,
    '',
    input.assignedBy
      ? `${input.assignedBy} has assigned you the review of comeback #${input.comebackId}.`
      : `A reel has come back ${where}.`,
    `${input.customerName}'s ${input.reel} was checked in as job #${input.returnJobId}, ${days(input.daysSinceCollection)} after job #${input.originalJobId} was collected. ${how}`,
    ...(input.symptom ? ['', `What the customer reports: ${input.symptom}`] : []),
    '',
    `Review it within ${days(input.reviewDeadlineDays)}: confirm or dismiss it, find the root cause and record the disposition.`,
    appLink(
      `/comebacks/${input.comebackId}`,
      input.baseUrl === undefined ? appBaseUrl() : input.baseUrl,
    ),
    '',
    '— Reelwright',
  ].join('\n');
  return { subject, text };
}
