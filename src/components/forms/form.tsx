import { zodResolver } from "@hookform/resolvers/zod";
import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";
import { useForm, type FieldValues, type UseFormProps, type UseFormRegisterReturn } from "react-hook-form";
import type { ZodType, ZodTypeDef } from "zod";

/** react-hook-form bound to the same zod schema the API route parses with. */
export function useZodForm<T extends FieldValues>(schema: ZodType<T, ZodTypeDef, unknown>, options: Omit<UseFormProps<T>, "resolver"> = {}) {
  // The resolver's overloads want the schema's input type to be FieldValues; ours is `unknown`.
  const resolver = zodResolver(schema as unknown as Parameters<typeof zodResolver>[0]);
  return useForm<T>({ ...options, resolver: resolver as never, mode: "onTouched" });
}

interface FieldProps extends InputHTMLAttributes<HTMLInputElement> {
  label: string;
  registration: UseFormRegisterReturn;
  error?: string | undefined;
  hint?: ReactNode;
}

/** A labelled input with its error announced to assistive technology. */
export function Field({ label, registration, error, hint, ...input }: FieldProps) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <input id={id} className="input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} {...input} {...registration} />
      {hint && !error && <p className="text-xs text-[var(--color-muted)]">{hint}</p>}
      {error && (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}

interface SelectFieldProps extends SelectHTMLAttributes<HTMLSelectElement> {
  label: string;
  registration: UseFormRegisterReturn;
  options: { value: string | number; label: string }[];
  error?: string | undefined;
  /** A first, empty choice such as "Choose…". */
  placeholder?: string;
}

/** A labelled select with its error announced to assistive technology. */
export function SelectField({ label, registration, options, error, placeholder, ...select }: SelectFieldProps) {
  const id = useId();
  return (
    <div className="field">
      <label htmlFor={id}>{label}</label>
      <select id={id} className="input" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} {...select} {...registration}>
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      {error && (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}
