/** Papin's mark: a digester vessel whose lid carries a weighted safety valve. */
export function PapinMark({ className = "h-7 w-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect x="7" y="11" width="18" height="16" rx="3" fill="#a66a1f" />
      <rect x="5" y="9" width="22" height="3" rx="1.5" fill="#6d4210" />
      <path d="M16 9V5h8" stroke="#1f2328" strokeWidth="1.6" fill="none" strokeLinecap="round" />
      <circle cx="24.5" cy="5" r="2.2" fill="#1f2328" />
      <path d="M11 20c2-2 4 2 6 0s4 2 6 0" stroke="#f7f5f0" strokeWidth="1.4" fill="none" strokeLinecap="round" />
    </svg>
  );
}
