/**
 * Reelwright's mark: a spool seen from the side, its two brass flanges holding the wound line,
 * and the line leaving the spool along its tangent, on sea-green. app/icon.svg is the same drawing.
 */
export function Logo({ className = 'size-9' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="7" fill="#1f514a" />
      <rect x="5" y="6.5" width="15" height="3" rx="1.5" fill="#d8b66a" />
      <rect x="5" y="22.5" width="15" height="3" rx="1.5" fill="#d8b66a" />
      <rect x="7.5" y="9.5" width="10" height="13" fill="#f5f0e6" />
      <path d="M7.5 13.5h10M7.5 18.5h10" stroke="#1f514a" strokeWidth="1" />
      <path
        d="M17.5 12.5c4 0 7.5-1.5 9.5-6.5"
        fill="none"
        stroke="#f5f0e6"
        strokeWidth="2"
        strokeLinecap="round"
      />
    </svg>
  );
}
