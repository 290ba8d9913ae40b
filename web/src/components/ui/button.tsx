import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'ghost' | 'danger';

const VARIANTS: Record<Variant, string> = {
  // Primary is ink on canvas, not a brand colour: colour stays reserved for attention.
  primary: 'bg-ink text-canvas hover:opacity-90 border border-ink',
  secondary: 'bg-panel text-ink border border-line-strong hover:bg-panel-2',
  ghost: 'bg-transparent text-ink border border-transparent hover:bg-panel-2',
  danger: 'bg-attention-1-fill text-attention-1-on border border-attention-1 hover:opacity-90',
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: 'sm' | 'md' };

export function Button({ variant = 'secondary', size = 'md', className = '', type = 'button', ...rest }: ButtonProps) {
  const sizing = size === 'sm' ? 'h-8 px-3 text-sm' : 'h-10 px-4 text-base';
  return (
    <button
      type={type}
      className={`inline-flex items-center justify-center gap-2 rounded-md font-semibold transition-opacity disabled:cursor-not-allowed disabled:opacity-50 ${sizing} ${VARIANTS[variant]} ${className}`}
      {...rest}
    />
  );
}
