/** Kinarc's mark: an arc swept from a pivot, the shape of a joint angle. Drawn for Kinarc. */
export function KinarcMark({ className = "" }: { className?: string }) {
  return (
    <svg viewBox="0 0 48 48" className={className} role="img" aria-label="Kinarc">
      <rect width="48" height="48" rx="12" fill="#155952" />
      <path d="M12 36 L36 36" stroke="#eef7f6" strokeWidth="4" strokeLinecap="round" />
      <path d="M12 36 L28 14" stroke="#eef7f6" strokeWidth="4" strokeLinecap="round" />
      <path d="M26 36 A14 14 0 0 0 20.3 24.7" fill="none" stroke="#f4b860" strokeWidth="3.5" strokeLinecap="round" />
      <circle cx="12" cy="36" r="3.5" fill="#f4b860" />
    </svg>
  );
}
