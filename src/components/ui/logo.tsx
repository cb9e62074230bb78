/**
 * Inhibitrack's mark: an enzyme drawn as a ring with its active-site pocket cut out, and a
 * small inhibitor wedge sitting in the pocket.
 */
export function LogoMark({ size = 22 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 24 24" aria-hidden="true" focusable="false">
      <path d="M12 2.5a9.5 9.5 0 1 0 9.1 12.2l-5.4-1.6a4 4 0 1 1 0-2.2l5.4-1.6A9.5 9.5 0 0 0 12 2.5z" fill="#0f766e" />
      <path d="M17.2 12l4.3-2.2v4.4z" fill="#a16207" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2 font-semibold tracking-tight text-ink">
      <LogoMark />
      <span>Inhibitrack</span>
    </span>
  );
}
