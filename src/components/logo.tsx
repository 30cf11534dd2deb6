/** Shellwright's mark: a drop of polish on a walnut square, with a highlight like a fresh gloss. */
export function Logo({ className = 'h-8 w-8' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden>
      <rect width="32" height="32" rx="7" fill="#3a2418" />
      <path d="M16 5c4.5 6 8 10.3 8 14.2A8 8 0 0 1 8 19.2C8 15.3 11.5 11 16 5z" fill="#d9932f" />
      <path d="M12.5 19.5a3.5 3.5 0 0 0 3.5 3.5" stroke="#f7e7c6" strokeWidth="1.8" fill="none" strokeLinecap="round" />
    </svg>
  );
}
