import Link from 'next/link';
import type { ButtonHTMLAttributes, ReactNode } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';

const base =
  'inline-flex items-center justify-center gap-1.5 rounded-md px-3 py-1.5 text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50';
const variants: Record<Variant, string> = {
  primary: 'bg-lagoon-600 text-ink-50 hover:bg-lagoon-400 hover:text-ink-900',
  secondary: 'border border-ink-600 bg-ink-800 text-ink-100 hover:border-ink-400',
  danger: 'border border-hazard-700 bg-transparent text-hazard-100 hover:bg-hazard-700',
  ghost: 'text-ink-200 hover:bg-ink-800',
};

/** Class list of a button of the given variant (also for links styled as buttons). */
export function buttonClass(variant: Variant = 'primary', extra = ''): string {
  return `${base} ${variants[variant]} ${extra}`;
}

/** A button; `pending` disables it and shows `pendingLabel` (forms disable while a request runs). */
export function Button({
  variant = 'primary',
  pending = false,
  pendingLabel,
  className = '',
  children,
  disabled,
  type = 'button',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; pending?: boolean; pendingLabel?: ReactNode }) {
  return (
    <button type={type} className={buttonClass(variant, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending && pendingLabel ? pendingLabel : children}
    </button>
  );
}

/** A link that looks like a button. */
export function ButtonLink({ href, variant = 'primary', className = '', children, ...rest }: { href: string; variant?: Variant; className?: string; children: ReactNode; 'data-testid'?: string }) {
  return (
    <Link href={href} className={buttonClass(variant, className)} {...rest}>
      {children}
    </Link>
  );
}
