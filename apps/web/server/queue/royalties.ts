import { and, eq, isNotNull, isNull, type Db } from '@reelwright/db';
import { monthCloses, users } from '@reelwright/db/schema';
import { conflict, forbidden } from '../errors';
import { issueRoyaltyInvoices, type IssueResult } from '../month-close/invoices';
import { monthLabel } from '../month-close/period';
import { scopeOf, type Principal } from '../principal';
import { currentClose } from '../queries/month-close';
import * as clock from '~/server/clock';

export interface RoyaltyRequest {
  month: string;
  requestedAt: Date;
  /** Null while the job has not issued every invoice yet. */
  doneAt: Date | null;
}

/**
 * The owner's click: marks the month's standing close as asked to be invoiced. The royalty job then
 * issues the invoices one shop after another (the month-close page shows them arriving). Asking
 * again while it runs changes nothing; asking after it finished asks for what is missing.
 */
export async function requestRoyaltyInvoices(
  conn: Db,
  principal: Principal,
  month: string,
): Promise<RoyaltyRequest> {
  if (principal.scope.kind !== 'network')
    throw forbidden('Only the owner issues royalty invoices.');
  const close = await currentClose(conn, month);
  if (!close) throw conflict(`Close ${monthLabel(month)} before issuing its royalty invoices.`);
  const running = close.invoicesRequestedAt && !close.invoicesDoneAt;
  if (running) return { month, requestedAt: close.invoicesRequestedAt!, doneAt: null };
  const [row] = await conn
    .update(monthCloses)
    .set({
      invoicesRequestedAt: clock.now(),
      invoicesRequestedById: principal.id,
      invoicesDoneAt: null,
    })
    .where(eq(monthCloses.id, close.id))
    .returning();
  return { month, requestedAt: row!.invoicesRequestedAt!, doneAt: null };
}

/**
 * The royalty job: issues the invoices of each month asked for and not done (one month, or all of
 * them for the minute's sweep). `issueRoyaltyInvoices` keys every provider call by shop and month
 * and skips what is issued, so a second run, or one on another instance, bills nobody twice. A
 * shop that failed leaves the month not done and the error is thrown for the queue to retry.
 */
export async function issueRequestedRoyalties(conn: Db, month?: string): Promise<IssueResult[]> {
  const pending = await conn
    .select({
      id: monthCloses.id,
      month: monthCloses.month,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      shopId: users.shopId,
      regionId: users.regionId,
    })
    .from(monthCloses)
    .innerJoin(users, eq(users.id, monthCloses.invoicesRequestedById))
    .where(
      and(
        isNull(monthCloses.reopenedAt),
        isNotNull(monthCloses.invoicesRequestedAt),
        isNull(monthCloses.invoicesDoneAt),
        month ? eq(monthCloses.month, month) : undefined,
      ),
    );
  const results: IssueResult[] = [];
  for (const close of pending) {
    const principal: Principal = {
      id: close.userId,
      name: close.name,
      email: close.email,
      role: close.role,
      shopId: close.shopId,
      regionId: close.regionId,
      scope: scopeOf(close),
    };
    const result = await issueRoyaltyInvoices(principal, close.month);
    results.push(result);
    if (result.failed) {
      const first = result.invoices.find((i) => i.outcome === 'failed');
      throw new Error(
        `${result.failed} royalty invoice(s) of ${close.month} failed: ${first?.error ?? ''}`,
      );
    }
    await conn
      .update(monthCloses)
      .set({ invoicesDoneAt: clock.now() })
      .where(and(eq(monthCloses.id, close.id), isNull(monthCloses.invoicesDoneAt)));
  }
  return results;
}
