import Link from 'next/link';

/**
 * Kilorung's wordmark: a three-rung stepped line (each step one ladder stage lifting the
 * voltage) in copper, beside the name.
 */
export function Wordmark({ href = '/', size = 'md' }: { href?: string; size?: 'md' | 'lg' }) {
  const box = size === 'lg' ? 'h-9 w-9' : 'h-6 w-6';
  const text = size === 'lg' ? 'text-3xl' : 'text-lg';
  return (
    <Link href={href} className="inline-flex items-center gap-2 rounded" aria-label="Kilorung home" data-testid="wordmark">
      <svg viewBox="0 0 24 24" className={box} aria-hidden="true" focusable="false">
        <rect x="0.75" y="0.75" width="22.5" height="22.5" rx="5" fill="none" stroke="#46545f" strokeWidth="1.5" />
        <path d="M4 19 H8 V14 H12 V9 H16 V5 H20" fill="none" stroke="#e08a4c" strokeWidth="2.2" strokeLinecap="round" strokeLinejoin="round" />
        <circle cx="20" cy="5" r="1.6" fill="#2fa69b" />
      </svg>
      <span className={`${text} font-semibold tracking-tight text-ink-50`}>
        kilo<span className="text-copper-400">rung</span>
      </span>
    </Link>
  );
}
