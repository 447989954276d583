import type { ComponentProps, ReactNode } from "react";

const INPUT = "mt-1 block w-full rounded-lg border border-sand-200 bg-white px-3 py-2 text-base text-ink shadow-sm focus:border-tide-500 aria-[invalid=true]:border-flag-rose";

interface FieldShell {
  label: string;
  name: string;
  /** Defaults to the name; give one when two forms on a page share a field name. */
  id?: string;
  error?: string;
  hint?: ReactNode;
}

function Shell({ label, id, error, hint, children }: Omit<FieldShell, "name"> & { id: string; children: ReactNode }) {
  return (
    <div>
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      {children}
      {hint && !error ? <p className="mt-1 text-xs text-ink-faint">{hint}</p> : null}
      {error ? (
        <p id={`${id}-error`} role="alert" className="mt-1 text-sm text-flag-rose">
          {error}
        </p>
      ) : null}
    </div>
  );
}

export function TextField({ label, name, id = name, error, hint, ...input }: FieldShell & ComponentProps<"input">) {
  return (
    <Shell label={label} id={id} error={error} hint={hint}>
      <input id={id} name={name} aria-invalid={Boolean(error)} aria-describedby={error ? `${id}-error` : undefined} className={INPUT} {...input} />
    </Shell>
  );
}

export function TextArea({ label, name, id = name, error, hint, ...input }: FieldShell & ComponentProps<"textarea">) {
  return (
    <Shell label={label} id={id} error={error} hint={hint}>
      <textarea id={id} name={name} rows={3} aria-invalid={Boolean(error)} aria-describedby={error ? `${id}-error` : undefined} className={INPUT} {...input} />
    </Shell>
  );
}

export function SelectField({
  label,
  name,
  id = name,
  error,
  hint,
  options,
  ...select
}: FieldShell & ComponentProps<"select"> & { options: readonly { value: string; label: string }[] }) {
  return (
    <Shell label={label} id={id} error={error} hint={hint}>
      <select id={id} name={name} aria-invalid={Boolean(error)} aria-describedby={error ? `${id}-error` : undefined} className={INPUT} {...select}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </Shell>
  );
}

export function FormMessage({ state }: { state?: { ok?: boolean; message?: string } | null }) {
  if (!state?.message) return null;
  return (
    <p role={state.ok ? "status" : "alert"} className={`rounded-lg px-3 py-2 text-sm ${state.ok ? "bg-tide-50 text-tide-700" : "bg-flag-roseBg text-flag-rose"}`}>
      {state.message}
    </p>
  );
}
