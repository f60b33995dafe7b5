import { dehydrate, HydrationBoundary, QueryClient } from '@tanstack/react-query';
import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { NotAllowed } from '~/components/ui';
import { can } from '~/lib/permissions';
import { comebackDetailQuery } from '~/lib/queries/comebacks';
import { idParam } from '~/lib/validators/common';
import { ApiError } from '~/server/errors';
import { getComeback } from '~/server/queries/comebacks';
import { requirePagePrincipal } from '~/server/session';
import { ReviewView } from './_components/review-view';

export const dynamic = 'force-dynamic';

export async function generateMetadata(props: {
  params: Promise<{ id: string }>;
}): Promise<Metadata> {
  return { title: `Comeback #${(await props.params).id}` };
}

export default async function ComebackPage(props: { params: Promise<{ id: string }> }) {
  const principal = await requirePagePrincipal();
  if (!can(principal.role, 'comebacks:read')) return <NotAllowed />;
  const id = idParam.safeParse((await props.params).id);
  if (!id.success) notFound();
  const queryClient = new QueryClient();
  try {
    queryClient.setQueryData(
      comebackDetailQuery(id.data).queryKey,
      await getComeback(principal, id.data),
    );
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) notFound();
    throw error;
  }
  return (
    <HydrationBoundary state={dehydrate(queryClient)}>
      <ReviewView id={id.data} />
    </HydrationBoundary>
  );
}
