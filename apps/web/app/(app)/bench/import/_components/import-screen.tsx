'use client';

import { useQuery } from '@tanstack/react-query';
import { useId } from 'react';
import { importHistoryQuery } from '~/lib/queries/imports';
import type { ImportHistoryRow } from '~/server/imports/history';
import { CheckStep } from './check-step';
import { ColumnMappingStep } from './column-mapping-step';
import { FileStep } from './file-step';
import { ImportHistory } from './import-history';
import { TemplateStep } from './template-step';
import { useCsvImport } from './use-csv-import';

/** Reading, mapping, checking and sending a CSV of past jobs, each step with its progress. */
export function ImportScreen(props: {
  shopName: string;
  timeZone: string;
  history: ImportHistoryRow[];
}) {
  const id = useId();
  const csv = useCsvImport(props.timeZone);
  const history = useQuery({ ...importHistoryQuery(), initialData: { imports: props.history } });
  return (
    <div className="space-y-6">
      <TemplateStep shopName={props.shopName} timeZone={props.timeZone} />
      <FileStep id={id} csv={csv} />
      {csv.read && <ColumnMappingStep id={id} csv={csv} read={csv.read} />}
      {csv.read && <CheckStep csv={csv} read={csv.read} />}
      <ImportHistory rows={history.data.imports} timeZone={props.timeZone} />
    </div>
  );
}
