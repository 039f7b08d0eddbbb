import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from 'react';

/** Label, control, hint and error, wired together for screen readers. */
export function Field({ id, label, hint, error, children }: { id: string; label: string; hint?: ReactNode; error?: string | string[]; children: ReactNode }) {
  const message = Array.isArray(error) ? error.join(' ') : error;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-bold text-ink">
        {label}
      </label>
      {children}
      {hint && !message ? (
        <p id={`${id}-hint`} className="text-xs text-brine">
          {hint}
        </p>
      ) : null}
      {message ? (
        <p id={`${id}-error`} role="alert" className="flex items-start gap-1 text-sm font-bold text-rust">
          <span aria-hidden="true">✕</span>
          {message}
        </p>
      ) : null}
    </div>
  );
}

const controlClass =
  'w-full rounded-control border bg-white px-3 py-2 text-ink shadow-sm placeholder:text-brine/70 focus:border-frost aria-[invalid=true]:border-rust';

export function describedBy(id: string, hasError: boolean, hasHint: boolean): string | undefined {
  if (hasError) return `${id}-error`;
  return hasHint ? `${id}-hint` : undefined;
}

export function TextInput({ invalid, className = '', ...props }: InputHTMLAttributes<HTMLInputElement> & { invalid?: boolean }) {
  return <input {...props} aria-invalid={invalid || undefined} className={`${controlClass} border-line ${className}`} />;
}

export function TextArea({ invalid, className = '', ...props }: TextareaHTMLAttributes<HTMLTextAreaElement> & { invalid?: boolean }) {
  return <textarea {...props} aria-invalid={invalid || undefined} className={`${controlClass} border-line ${className}`} />;
}

export function Select({ invalid, className = '', ...props }: SelectHTMLAttributes<HTMLSelectElement> & { invalid?: boolean }) {
  return <select {...props} aria-invalid={invalid || undefined} className={`${controlClass} border-line ${className}`} />;
}

/** The form-wide message: what happened, in words, with a shape as well as a colour. */
export function FormMessage({ tone, children }: { tone: 'error' | 'success'; children: ReactNode }) {
  const style = tone === 'error' ? 'border-rust bg-rust-soft text-rust' : 'border-clover bg-clover-soft text-clover';
  return (
    <div role={tone === 'error' ? 'alert' : 'status'} className={`flex items-start gap-2 rounded-control border px-3 py-2 text-sm font-bold ${style}`}>
      <span aria-hidden="true">{tone === 'error' ? '✕' : '✓'}</span>
      <span>{children}</span>
    </div>
  );
}
