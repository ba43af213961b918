/** Wingstage's mark: a swept wing over three rising steps (the staged estimate). */
export function Mark({ size = 32, className = '' }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false" className={className}>
      <rect width="32" height="32" rx="7" fill="#0b5e63" />
      <path d="M16 4.5 27.5 13 16 10.8 4.5 13Z" fill="#f4efe3" />
      <path d="M6 27v-4h6.5v-4H19v-4h7v12Z" fill="#f4efe3" />
    </svg>
  );
}

export function Wordmark({ className = '' }: { className?: string }) {
  return (
    <svg viewBox="0 0 150 32" height="28" role="img" aria-label="Wingstage" className={className}>
      <rect width="32" height="32" rx="7" fill="#0b5e63" />
      <path d="M16 4.5 27.5 13 16 10.8 4.5 13Z" fill="#f4efe3" />
      <path d="M6 27v-4h6.5v-4H19v-4h7v12Z" fill="#f4efe3" />
      <text x="40" y="23" fontFamily="'Source Sans 3', sans-serif" fontSize="21" fill="#1e2a33" letterSpacing="-0.2">
        <tspan fontWeight="700">Wing</tspan>
        <tspan fontWeight="400">stage</tspan>
      </text>
    </svg>
  );
}
