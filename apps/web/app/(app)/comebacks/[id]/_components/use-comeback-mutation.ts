'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ProblemError, sendJson } from '~/lib/api-client';
import { auditKeys } from '~/lib/queries/audits';
import { comebackKeys } from '~/lib/queries/comebacks';
import type { ComebackPatchInput } from '~/lib/validators/comebacks';
import type { ComebackDetail } from '~/server/queries/comebacks';

/** A change to the review: the answer replaces the cached comeback; queues and flags refetch. */
export function useComebackMutation(id: number) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ComebackPatchInput) =>
      sendJson<ComebackDetail>('PATCH', `/api/comebacks/${id}`, body),
    onSuccess: (comeback) => {
      queryClient.setQueryData(comebackKeys.detail(id), comeback);
      void queryClient.invalidateQueries({ queryKey: comebackKeys.lists });
      void queryClient.invalidateQueries({ queryKey: comebackKeys.job(comeback.returnJob.id) });
      void queryClient.invalidateQueries({ queryKey: auditKeys.allCorrectiveActions });
    },
  });
}

/** Field messages of a failed write, keyed by the field's path without "body.". */
export function fieldErrors(error: unknown): Record<string, string> {
  if (!(error instanceof ProblemError)) return {};
  const out: Record<string, string> = {};
  for (const e of error.problem.errors ?? []) {
    const key = e.field.replace(/^body\./, '');
    out[key] ??= e.message;
  }
  return out;
}
