/** Reelwright's mark: a spool with its line running off, in brass on sea-green. */
export function Logo({ className = 'size-9' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill="#1f514a" />
      <circle cx="15" cy="17" r="8.5" fill="none" stroke="#d8b66a" strokeWidth="2.5" />
      <circle cx="15" cy="17" r="2.5" fill="#d8b66a" />
      <path d="M21 11l5-5" stroke="#f5f0e6" strokeWidth="2.5" strokeLinecap="round" />
    </svg>
  );
}
