export function LogoMark({ className = "h-8 w-8" }: { className?: string }) {
  return (
    <svg viewBox="0 0 64 64" className={className} aria-hidden="true">
      <path d="M32 3 L56 11 V29 C56 44.5 46 55 32 61 C18 55 8 44.5 8 29 V11 Z" fill="#0e5a63" />
      <path d="M20.5 20 H43.5 L20.5 41 H43.5" fill="none" stroke="#ffffff" strokeWidth="5.5" strokeLinecap="round" strokeLinejoin="round" />
      <path d="M22 50.5 q5 -3.5 10 0 t10 0" fill="none" stroke="#e8c27a" strokeWidth="3.2" strokeLinecap="round" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2">
      <LogoMark />
      <span className="text-xl font-bold tracking-tight text-estuary-800">Zoneward</span>
    </span>
  );
}
