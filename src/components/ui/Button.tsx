import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'plain' | 'danger';
const styles: Record<Variant, string> = {
  primary: 'bg-action text-white hover:bg-action-dark disabled:opacity-50',
  plain: 'border border-paper-edge bg-white/60 text-ink hover:bg-paper-deep disabled:opacity-50',
  danger: 'border border-refusal text-refusal hover:bg-refusal-light disabled:opacity-50',
};

export function Button({ variant = 'plain', className = '', ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type="button" {...props} className={`rounded px-3 py-1.5 text-sm font-medium ${styles[variant]} ${className}`} />;
}
