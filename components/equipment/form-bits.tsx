"use client";

import { startTransition, useActionState, useEffect, useRef, useState, type FormEvent, type ReactNode } from "react";
import { IDLE_FORM_STATE, type FormState } from "@/lib/form-state";

type Action = (prev: FormState, formData: FormData) => Promise<FormState>;

/**
 * useActionState without React's automatic form reset: on an error the user's entries stay in
 * place beside their messages. `resetOnSuccess` clears a create form once it has been saved.
 */
export function useFormAction(action: Action, { resetOnSuccess = false }: { resetOnSuccess?: boolean } = {}) {
  const [state, dispatch, pending] = useActionState(action, IDLE_FORM_STATE);
  const formRef = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (resetOnSuccess && state.status === "ok") formRef.current?.reset();
  }, [state, resetOnSuccess]);
  // A field's message goes once the user changes that field; the next result brings fresh ones.
  const [edited, setEdited] = useState<ReadonlySet<string>>(new Set());
  const [editedSince, setEditedSince] = useState(state);
  if (editedSince !== state) {
    setEditedSince(state);
    setEdited(new Set());
  }
  const onSubmit = (event: FormEvent<HTMLFormElement>) => {
    event.preventDefault();
    const data = new FormData(event.currentTarget);
    startTransition(() => dispatch(data));
  };
  const onChange = (event: FormEvent<HTMLFormElement>) => {
    const name = (event.target as HTMLInputElement).name;
    if (name && state.fieldErrors?.[name] && !edited.has(name)) setEdited(new Set(edited).add(name));
  };
  const errors = Object.fromEntries(Object.entries(state.fieldErrors ?? {}).filter(([name]) => !edited.has(name)));
  return { state, pending, formRef, onSubmit, onChange, errors };
}

export function Field({ id, label, error, hint, children }: { id: string; label: ReactNode; error?: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <div>
      <label className="field-label" htmlFor={id}>
        {label}
      </label>
      {children}
      {hint && !error && (
        <p className="mt-1 text-xs text-ink-muted" id={`${id}-hint`}>
          {hint}
        </p>
      )}
      {error && (
        <p className="field-error" id={`${id}-error`}>
          {error}
        </p>
      )}
    </div>
  );
}

/** A text or number input wired to its label, hint and error. */
export function TextInput({
  id,
  name,
  label,
  error,
  hint,
  defaultValue,
  suffix,
  type = "text",
  inputMode,
  placeholder,
  required,
  onChange,
  value,
}: {
  id: string;
  name: string;
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  defaultValue?: string | number | null;
  suffix?: string;
  type?: string;
  inputMode?: "decimal" | "numeric" | "text";
  placeholder?: string;
  required?: boolean;
  onChange?: (value: string) => void;
  value?: string;
}) {
  const describedBy = error ? `${id}-error` : hint ? `${id}-hint` : undefined;
  const input = (
    <input
      id={id}
      name={name}
      type={type}
      inputMode={inputMode}
      placeholder={placeholder}
      required={required}
      className="field-input"
      aria-invalid={!!error}
      aria-describedby={describedBy}
      {...(value !== undefined ? { value } : { defaultValue: defaultValue ?? undefined })}
      onChange={onChange ? (e) => onChange(e.target.value) : undefined}
    />
  );
  return (
    <Field id={id} label={label} error={error} hint={hint}>
      {suffix ? (
        <div className="flex items-center gap-2">
          {input}
          <span className="shrink-0 text-sm text-ink-muted">{suffix}</span>
        </div>
      ) : (
        input
      )}
    </Field>
  );
}
