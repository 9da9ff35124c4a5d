import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";

export const inputClass =
  "block w-full rounded-md border border-ink-200 bg-white px-3 py-2.5 text-base text-ink-900 shadow-sm placeholder:text-ink-400 focus:border-estuary-600 focus:outline-2 focus:outline-estuary-600 aria-[invalid=true]:border-fail-600 disabled:bg-ink-100";

interface FieldShellProps {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string | string[] | null;
  children: ReactNode;
  required?: boolean;
}

/** Label, control, hint and error, wired together so screen readers announce the error. */
export function FieldShell({ id, label, hint, error, children, required }: FieldShellProps) {
  const message = Array.isArray(error) ? error[0] : error;
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-semibold text-ink-800">
        {label}
        {required ? <span className="text-fail-600"> *</span> : null}
      </label>
      {children}
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-ink-600">
          {hint}
        </p>
      ) : null}
      {message ? (
        <p id={`${id}-error`} role="alert" className="text-sm font-medium text-fail-700">
          {message}
        </p>
      ) : null}
    </div>
  );
}

export function describedBy(id: string, hint?: unknown, error?: unknown): string | undefined {
  const ids = [hint ? `${id}-hint` : null, error && (!Array.isArray(error) || error.length) ? `${id}-error` : null].filter(Boolean);
  return ids.length ? ids.join(" ") : undefined;
}

type TextFieldProps = InputHTMLAttributes<HTMLInputElement> & { id: string; label: ReactNode; hint?: ReactNode; error?: string | string[] | null };

export function TextField({ id, label, hint, error, required, className = "", ...rest }: TextFieldProps) {
  const hasError = Boolean(Array.isArray(error) ? error.length : error);
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <input id={id} name={id} required={required} aria-invalid={hasError || undefined} aria-describedby={describedBy(id, hint, hasError ? error : null)} className={`${inputClass} ${className}`} {...rest} />
    </FieldShell>
  );
}

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: ReactNode; hint?: ReactNode; error?: string | string[] | null };

export function SelectField({ id, label, hint, error, required, className = "", children, ...rest }: SelectFieldProps) {
  const hasError = Boolean(Array.isArray(error) ? error.length : error);
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <select id={id} name={id} required={required} aria-invalid={hasError || undefined} aria-describedby={describedBy(id, hint, hasError ? error : null)} className={`${inputClass} ${className}`} {...rest}>
        {children}
      </select>
    </FieldShell>
  );
}

type TextAreaFieldProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { id: string; label: ReactNode; hint?: ReactNode; error?: string | string[] | null };

export function TextAreaField({ id, label, hint, error, required, className = "", ...rest }: TextAreaFieldProps) {
  const hasError = Boolean(Array.isArray(error) ? error.length : error);
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} required={required}>
      <textarea id={id} name={id} required={required} aria-invalid={hasError || undefined} aria-describedby={describedBy(id, hint, hasError ? error : null)} className={`${inputClass} ${className}`} {...rest} />
    </FieldShell>
  );
}
