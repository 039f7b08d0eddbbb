import type { ButtonHTMLAttributes } from 'react';
import Link, { type LinkProps } from 'next/link';

type Variant = 'primary' | 'secondary' | 'danger' | 'quiet';

const variants: Record<Variant, string> = {
  primary: 'bg-frost text-white hover:bg-frost-dark border border-frost-dark',
  secondary: 'bg-white text-ink border border-line hover:border-brine',
  danger: 'bg-rust text-white border border-rust hover:brightness-95',
  quiet: 'bg-transparent text-frost-dark border border-transparent hover:underline',
};

export function buttonClass(variant: Variant = 'primary', extra = ''): string {
  return `inline-flex items-center justify-center gap-2 rounded-control px-4 py-2 text-sm font-bold transition disabled:cursor-not-allowed disabled:opacity-60 ${variants[variant]} ${extra}`;
}

export function Button({ variant = 'primary', className = '', ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button {...props} className={buttonClass(variant, className)} />;
}

export function ButtonLink({ variant = 'primary', className = '', children, ...props }: LinkProps & { variant?: Variant; className?: string; children: React.ReactNode }) {
  return (
    <Link {...props} className={`${buttonClass(variant, className)} hover:no-underline`}>
      {children}
    </Link>
  );
}
