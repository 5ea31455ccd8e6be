import { useId, useState, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";
import { useForm, type FieldValues, type Resolver, type UseFormProps, type UseFormRegisterReturn } from "react-hook-form";
import type { ZodType, ZodTypeDef } from "zod";

type FormSchema<T> = ZodType<T, ZodTypeDef, unknown>;

/**
 * The schema itself, or a function that imports it. A form whose schema pulls in much (zod, the
 * reagent catalogue) passes `() => import("…").then((m) => m.schema)`, so the page does not carry it.
 */
export type SchemaSource<T> = FormSchema<T> | (() => Promise<FormSchema<T>>);

/**
 * zodResolver and the schema, loaded at the form's first check (a field left, or a submit) rather
 * than with the page. Should that load fail, the form goes out unchecked: the API route parses the
 * same schema and answers with the field at fault, which every form shows. The next check retries.
 */
function deferredResolver<T extends FieldValues>(load: () => Promise<FormSchema<T>>): Resolver<T> {
  let loading: Promise<Resolver<T>> | null = null;
  return async (values, context, options) => {
    // The resolver's overloads want the schema's input type to be FieldValues; ours is `unknown`.
    loading ??= Promise.all([import("@hookform/resolvers/zod"), load()]).then(
      ([{ zodResolver }, schema]) => zodResolver(schema as never) as unknown as Resolver<T>,
    );
    let resolve: Resolver<T>;
    try {
      resolve = await loading;
    } catch {
      loading = null;
      return { values, errors: {} };
    }
    return resolve(values, context, options);
  };
}

/** react-hook-form bound to the same zod schema the API route parses with. */
export function useZodForm<T extends FieldValues>(schema: SchemaSource<T>, options: Omit<UseFormProps<T>, "resolver"> = {}) {
  const [resolver] = useState(() => deferredResolver(typeof schema === "function" ? schema : async () => schema));
  return useForm<T>({ ...options, resolver, mode: "onTouched" });
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
      <input
        id={id}
        className="input"
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        {...input}
        {...registration}
      />
      {hint && !error && <p className="text-xs text-[var(--color-muted)]">{hint}</p>}
      {error && (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      )}
    </div>
  );
}

export interface SelectOption {
  value: string | number;
  label: string;
  /** Written on the option as data-* attributes (e.g. `{ ml: 250 }` → data-ml="250"), for scripts and tests. */
  data?: Record<string, string | number>;
}

interface SelectFieldProps extends SelectHTMLAttributes<HTMLSelectElement> {
  label: string;
  registration: UseFormRegisterReturn;
  options: SelectOption[];
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
      <select
        id={id}
        className="input"
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        {...select}
        {...registration}
      >
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value} {...Object.fromEntries(Object.entries(o.data ?? {}).map(([k, v]) => [`data-${k}`, v]))}>
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
