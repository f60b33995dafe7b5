/** Class names of the month-close screen's select and buttons. */
export const field =
  'min-h-11 rounded-md border border-sand-300 bg-white px-3 text-slate-900 shadow-sm focus-visible:border-sea-600';
export const primary =
  'inline-flex min-h-11 items-center justify-center rounded-md bg-sea-700 px-4 font-medium text-white shadow-sm hover:bg-sea-800 disabled:cursor-not-allowed disabled:bg-sand-200 disabled:text-slate-700 disabled:shadow-none';
export const secondary =
  'inline-flex min-h-11 items-center justify-center rounded-md border border-sea-700 bg-white px-4 font-medium text-sea-800 hover:bg-sea-50 disabled:cursor-not-allowed disabled:border-slate-300 disabled:text-slate-500';
