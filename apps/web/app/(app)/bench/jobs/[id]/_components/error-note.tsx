import { problemText } from './use-job-mutation';

export function ErrorNote({ error }: { error: unknown }) {
  if (!error) return null;
  return (
    <p
      role="alert"
      className="mt-3 rounded-md border border-brick-200 bg-brick-50 px-3 py-2 text-brick-800"
    >
      {problemText(error)}
    </p>
  );
}
