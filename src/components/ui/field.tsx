import { forwardRef, useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";
import { cx } from "./cx";

const control = "w-full rounded-md border border-paper-line bg-paper-raised px-3 py-2 text-base min-h-10 focus:border-brass disabled:bg-paper-sunk";

interface FieldShellProps {
  label: string;
  error?: string;
  hint?: ReactNode;
  children: (id: string, describedBy?: string) => ReactNode;
  className?: string;
}

/** A labelled control with its hint and error, wired for screen readers. */
export function FieldShell({ label, error, hint, children, className }: FieldShellProps) {
  const id = useId();
  const describedBy = error ? `${id}-err` : hint ? `${id}-hint` : undefined;
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={id} className="text-sm font-semibold text-ink-soft">
        {label}
      </label>
      {children(id, describedBy)}
      {hint && !error && (
        <p id={`${id}-hint`} className="text-xs text-ink-faint">
          {hint}
        </p>
      )}
      {error && (
        <p id={`${id}-err`} role="alert" className="text-sm text-stop">
          {error}
        </p>
      )}
    </div>
  );
}

type InputProps = InputHTMLAttributes<HTMLInputElement> & { label: string; error?: string; hint?: ReactNode; wrapperClassName?: string };
export const TextField = forwardRef<HTMLInputElement, InputProps>(function TextField({ label, error, hint, wrapperClassName, className, ...props }, ref) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={wrapperClassName}>
      {(id, describedBy) => <input ref={ref} id={id} aria-invalid={!!error} aria-describedby={describedBy} className={cx(control, className)} {...props} />}
    </FieldShell>
  );
});

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & { label: string; error?: string; hint?: ReactNode; wrapperClassName?: string };
export const SelectField = forwardRef<HTMLSelectElement, SelectProps>(function SelectField({ label, error, hint, wrapperClassName, className, children, ...props }, ref) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={wrapperClassName}>
      {(id, describedBy) => (
        <select ref={ref} id={id} aria-invalid={!!error} aria-describedby={describedBy} className={cx(control, className)} {...props}>
          {children}
        </select>
      )}
    </FieldShell>
  );
});

type AreaProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { label: string; error?: string; hint?: ReactNode; wrapperClassName?: string };
export const TextAreaField = forwardRef<HTMLTextAreaElement, AreaProps>(function TextAreaField({ label, error, hint, wrapperClassName, className, ...props }, ref) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={wrapperClassName}>
      {(id, describedBy) => <textarea ref={ref} id={id} aria-invalid={!!error} aria-describedby={describedBy} className={cx(control, "min-h-20", className)} {...props} />}
    </FieldShell>
  );
});
