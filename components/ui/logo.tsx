export function LogoMark({ className = "h-7 w-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect width="32" height="32" rx="7" fill="#1d5c63" />
      <path d="M16 5 26 11v10l-10 6-10-6V11z" fill="none" stroke="#f6f4ef" strokeWidth="2.2" strokeLinejoin="round" />
      <path d="M6 11l10 6 10-6M16 17v10" fill="none" stroke="#b8561b" strokeWidth="2.2" strokeLinejoin="round" />
    </svg>
  );
}

export function Logo() {
  return (
    <span className="flex items-center gap-2 text-lg font-semibold tracking-tight text-brand-dark">
      <LogoMark />
      Lithodex
    </span>
  );
}
