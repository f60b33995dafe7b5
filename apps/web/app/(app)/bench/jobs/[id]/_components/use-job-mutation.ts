'use client';

import { useMutation, useQueryClient } from '@tanstack/react-query';
import { ProblemError } from '~/lib/api-client';
import { jobKeys, type JobDetailJson } from '~/lib/queries/jobs';

/**
 * A write to one job. Every bench route answers with the fresh job, which replaces the cached
 * one; the lists are refetched because states, ages and totals shown there may have changed.
 */
export function useJobMutation<TVariables>(
  jobId: number,
  request: (variables: TVariables) => Promise<JobDetailJson>,
  options: {
    scope?: string;
    onMutate?: (variables: TVariables) => void;
    /** Whether this answer is still the one to show (false: a later write is on its way). */
    isLatest?: (variables: TVariables) => boolean;
  } = {},
) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: request,
    scope: options.scope ? { id: `job-${jobId}-${options.scope}` } : undefined,
    onMutate: async (variables) => {
      // A read already on its way would bring back the job as it was before this write.
      await queryClient.cancelQueries({ queryKey: jobKeys.detail(jobId) });
      options.onMutate?.(variables);
    },
    onSuccess: (job, variables) => {
      if (options.isLatest && !options.isLatest(variables)) return;
      queryClient.setQueryData(jobKeys.detail(jobId), job);
      void queryClient.invalidateQueries({ queryKey: jobKeys.lists });
    },
    onError: () => {
      void queryClient.invalidateQueries({ queryKey: jobKeys.detail(jobId) });
    },
  });
}

/** The words to show for a failed write: the problem's detail and any field messages. */
export function problemText(error: unknown): string {
  if (error instanceof ProblemError) {
    const fields = error.problem.errors?.map((e) => e.message) ?? [];
    const detail = error.problem.detail ?? error.problem.title ?? error.message;
    return fields.length ? fields.join(' ') : detail;
  }
  return error instanceof Error ? error.message : 'Something went wrong.';
}
