import { useId, type InputHTMLAttributes, type ReactNode, type Ref, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';

interface FieldShellProps {
  label: string;
  error?: string;
  hint?: ReactNode;
  children: (ids: { inputId: string; describedBy: string | undefined }) => ReactNode;
}

/** Label, control, hint and inline error, wired with ids so screen readers announce the message. */
function FieldShell({ label, error, hint, children }: FieldShellProps) {
  const inputId = useId();
  const hintId = `${inputId}-hint`;
  const errorId = `${inputId}-error`;
  const describedBy = [hint ? hintId : null, error ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={inputId} className="text-caption font-semibold uppercase tracking-wide text-ink-600">
        {label}
      </label>
      {children({ inputId, describedBy })}
      {hint && !error ? (
        <p id={hintId} className="text-caption text-ink-500">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} role="alert" className="text-caption font-semibold text-fault-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}

const controlClass = (error?: string) =>
  `rounded-chip border bg-white px-3 py-2 text-body text-ink-900 placeholder:text-ink-300 focus:outline-none focus:shadow-focus ${
    error ? 'border-fault-500' : 'border-ink-200 focus:border-phase-500'
  }`;

export function TextField({
  label,
  error,
  hint,
  ref,
  ...props
}: InputHTMLAttributes<HTMLInputElement> & { label: string; error?: string; hint?: ReactNode; ref?: Ref<HTMLInputElement> }) {
  return (
    <FieldShell label={label} error={error} hint={hint}>
      {({ inputId, describedBy }) => (
        <input
          id={inputId}
          ref={ref}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={controlClass(error)}
          {...props}
        />
      )}
    </FieldShell>
  );
}

export function SelectField({
  label,
  error,
  hint,
  ref,
  children,
  ...props
}: SelectHTMLAttributes<HTMLSelectElement> & { label: string; error?: string; hint?: ReactNode; ref?: Ref<HTMLSelectElement> }) {
  return (
    <FieldShell label={label} error={error} hint={hint}>
      {({ inputId, describedBy }) => (
        <select
          id={inputId}
          ref={ref}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={controlClass(error)}
          {...props}
        >
          {children}
        </select>
      )}
    </FieldShell>
  );
}

export function TextAreaField({
  label,
  error,
  hint,
  ref,
  ...props
}: TextareaHTMLAttributes<HTMLTextAreaElement> & { label: string; error?: string; hint?: ReactNode; ref?: Ref<HTMLTextAreaElement> }) {
  return (
    <FieldShell label={label} error={error} hint={hint}>
      {({ inputId, describedBy }) => (
        <textarea id={inputId} ref={ref} rows={3} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className={controlClass(error)} {...props} />
      )}
    </FieldShell>
  );
}

export function CheckboxField({
  label,
  hint,
  ref,
  ...props
}: InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: ReactNode; ref?: Ref<HTMLInputElement> }) {
  const id = useId();
  return (
    <div className="flex items-start gap-2.5 py-1">
      <input id={id} ref={ref} type="checkbox" className="mt-1 h-4 w-4 accent-copper-600" aria-describedby={hint ? `${id}-hint` : undefined} {...props} />
      <div>
        <label htmlFor={id} className="text-body font-semibold text-ink-800">{label}</label>
        {hint ? <p id={`${id}-hint`} className="text-caption text-ink-500">{hint}</p> : null}
      </div>
    </div>
  );
}
