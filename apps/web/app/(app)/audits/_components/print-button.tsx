'use client';

export function PrintButton() {
  return (
    <button
      type="button"
      onClick={() => window.print()}
      className="no-print inline-flex min-h-11 items-center rounded-md bg-sea-700 px-4 font-semibold text-white hover:bg-sea-800"
    >
      Print the report
    </button>
  );
}
