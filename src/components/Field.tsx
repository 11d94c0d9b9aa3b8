import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from 'react';
import { ErrorIcon } from './icons';

const control =
  'block w-full rounded-md border bg-white px-2.5 text-sm text-graphite-900 shadow-xs placeholder:text-graphite-400 ' +
  'focus:border-copper-500 focus:outline-2 focus:outline-offset-0 focus:outline-copper-500/35 disabled:bg-graphite-50 ';

function borderFor(invalid: boolean) {
  return invalid ? 'border-fault-600' : 'border-graphite-300';
}

interface FieldShellProps {
  label: string;
  hint?: ReactNode;
  errors?: string[];
  children: (ids: { inputId: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
}

/** Label, control, hint and the field's errors, wired with aria-describedby and announced politely. */
function FieldShell({ label, hint, errors, children }: FieldShellProps) {
  const inputId = useId();
  const hintId = `${inputId}-hint`;
  const errorId = `${inputId}-error`;
  const invalid = !!errors && errors.length > 0;
  const describedBy = [hint ? hintId : null, invalid ? errorId : null].filter(Boolean).join(' ') || undefined;
  return (
    <div className="space-y-1">
      <label htmlFor={inputId} className="block text-[13px] font-medium text-graphite-800">
        {label}
      </label>
      {children({ inputId, describedBy, invalid })}
      {hint ? (
        <p id={hintId} className="text-xs text-graphite-500">
          {hint}
        </p>
      ) : null}
      <div aria-live="polite">
        {invalid ? (
          <ul id={errorId} className="space-y-0.5">
            {errors!.map((message) => (
              <li key={message} className="flex items-start gap-1 text-xs font-medium text-fault-700">
                <ErrorIcon size={14} className="mt-px shrink-0" />
                <span>{message}</span>
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    </div>
  );
}

type TextFieldProps = InputHTMLAttributes<HTMLInputElement> & { label: string; hint?: ReactNode; errors?: string[] };

export function TextField({ label, hint, errors, className = '', ...rest }: TextFieldProps) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ inputId, describedBy, invalid }) => (
        <input
          id={inputId}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${control} h-9 ${borderFor(invalid)} ${className}`}
          {...rest}
        />
      )}
    </FieldShell>
  );
}

type TextAreaFieldProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { label: string; hint?: ReactNode; errors?: string[] };

export function TextAreaField({ label, hint, errors, className = '', ...rest }: TextAreaFieldProps) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ inputId, describedBy, invalid }) => (
        <textarea
          id={inputId}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${control} min-h-20 py-2 ${borderFor(invalid)} ${className}`}
          {...rest}
        />
      )}
    </FieldShell>
  );
}

type SelectFieldProps = SelectHTMLAttributes<HTMLSelectElement> & { label: string; hint?: ReactNode; errors?: string[] };

export function SelectField({ label, hint, errors, className = '', children, ...rest }: SelectFieldProps) {
  return (
    <FieldShell label={label} hint={hint} errors={errors}>
      {({ inputId, describedBy, invalid }) => (
        <select
          id={inputId}
          aria-describedby={describedBy}
          aria-invalid={invalid || undefined}
          className={`${control} h-9 ${borderFor(invalid)} ${className}`}
          {...rest}
        >
          {children}
        </select>
      )}
    </FieldShell>
  );
}

export function CheckboxField({
  label,
  className = '',
  ...rest
}: InputHTMLAttributes<HTMLInputElement> & { label: string }) {
  const id = useId();
  return (
    <div className={`flex items-center gap-2 ${className}`}>
      <input id={id} type="checkbox" className="size-4 rounded border-graphite-300 accent-copper-600" {...rest} />
      <label htmlFor={id} className="text-sm text-graphite-800">
        {label}
      </label>
    </div>
  );
}
