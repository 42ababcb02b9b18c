import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'quiet';

const VARIANTS: Record<Variant, string> = {
  primary: 'bg-weir-700 text-white hover:bg-weir-800 disabled:bg-ink-300 disabled:text-ink-700',
  secondary: 'bg-white text-ink-900 border border-ink-300 hover:border-ink-500 hover:bg-ink-50 disabled:text-ink-500',
  danger: 'bg-white text-sev-error border border-sev-error/60 hover:bg-sev-error-bg disabled:text-ink-500 disabled:border-ink-300',
  quiet: 'text-weir-700 hover:underline underline-offset-2 disabled:text-ink-500',
};

export function buttonClass(variant: Variant = 'primary', extra = ''): string {
  const pad = variant === 'quiet' ? 'px-1' : 'px-3.5 py-2';
  return `inline-flex items-center justify-center gap-2 rounded-md ${pad} font-medium text-body transition-colors ${VARIANTS[variant]} ${extra}`;
}

export function Button({ variant = 'primary', className = '', type = 'button', ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type={type} className={buttonClass(variant, className)} {...props} />;
}
