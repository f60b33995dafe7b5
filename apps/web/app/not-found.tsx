import Link from 'next/link';

export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-24">
      <h1 className="text-3xl font-semibold">Not found</h1>
      <p className="mt-3 text-lg text-slate-600">
        There is nothing here, or it belongs to a shop outside your view.
      </p>
      <Link href="/" className="mt-6 inline-block font-medium text-sea-700 underline">
        Back to your home page
      </Link>
    </main>
  );
}
