import { useMemo, useState } from "react";
import { formatDay, formatInstant, numberFormat } from "../../lib/format";
import type { FacilitySettings } from "../../lib/schemas/facility";
import { HydratedControls, IslandForm } from "../forms/island-form";
import { ApiError, errorMessage, postJson } from "../forms/post-json";

/** Locales offered first; any other BCP 47 tag the server can format in is accepted. */
const COMMON_LOCALES = ["en-GB", "en-US", "en-AU", "de-DE", "de-CH", "fr-FR", "es-ES", "pt-PT", "it-IT", "nl-NL", "sv-SE", "ja-JP"];
const COMMON_CURRENCIES = ["EUR", "CHF", "GBP", "USD", "AUD", "SEK", "JPY"];

/** The administrator's form for the facility's time zone, locale and currency. */
export default function FacilitySettingsForm({ initial }: { initial: FacilitySettings }) {
  const [saved, setSaved] = useState(initial);
  const [values, setValues] = useState(initial);
  const [errors, setErrors] = useState<Partial<Record<keyof FacilitySettings, string>>>({});
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const zones = useMemo(() => (typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : []), []);

  const preview = useMemo(() => {
    try {
      const now = new Date();
      return `${formatInstant(now, values)} · ${formatDay(now, values)} · ${numberFormat(values.locale, { maximumFractionDigits: 2 }).format(12345.67)} · ${numberFormat(values.locale, { style: "currency", currency: values.currency }).format(1234.5)}`;
    } catch {
      return null;
    }
  }, [values]);

  async function save(event: React.FormEvent) {
    event.preventDefault();
    setMessage(null);
    setErrors({});
    setBusy(true);
    try {
      const answer = await postJson<FacilitySettings>("/api/settings/facility", values, "PUT");
      const zoneChanged = answer.timeZone !== saved.timeZone;
      setSaved(answer);
      setValues(answer);
      setMessage({
        ok: true,
        text: zoneChanged
          ? `Saved. Days, months and billing periods now run from midnight to midnight in ${answer.timeZone}; the daily usage sums were rebuilt.`
          : "Saved.",
      });
    } catch (error) {
      if (error instanceof ApiError && error.fields) setErrors(error.fields as typeof errors);
      setMessage({ ok: false, text: errorMessage(error) });
    } finally {
      setBusy(false);
    }
  }

  const field = (name: keyof FacilitySettings, label: string, list: string, hint: string, options: string[]) => (
    <div className="field">
      <label htmlFor={`facility-${name}`}>{label}</label>
      <input
        id={`facility-${name}`}
        className="input"
        list={list}
        autoComplete="off"
        spellCheck={false}
        value={values[name]}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={`facility-${name}-hint${errors[name] ? ` facility-${name}-error` : ""}`}
        onChange={(e) => setValues({ ...values, [name]: e.target.value })}
      />
      <datalist id={list}>
        {options.map((o) => (
          <option key={o} value={o} />
        ))}
      </datalist>
      <p id={`facility-${name}-hint`} className="text-xs text-[var(--color-muted)]">
        {hint}
      </p>
      {errors[name] && (
        <p id={`facility-${name}-error`} className="field-error" role="alert">
          {errors[name]}
        </p>
      )}
    </div>
  );

  return (
    <IslandForm onSubmit={save} className="card grid max-w-2xl gap-4 p-5" noValidate aria-label="Facility settings">
      {field("timeZone", "Time zone", "facility-zones", "IANA name, e.g. Europe/Berlin. Times are typed and shown in this zone.", zones)}
      {field("locale", "Date and number format", "facility-locales", "Locale, e.g. de-DE or en-GB.", COMMON_LOCALES)}
      {field(
        "currency",
        "Default currency",
        "facility-currencies",
        "ISO 4217 code for new clients and rates, e.g. EUR.",
        COMMON_CURRENCIES,
      )}
      {preview && (
        <p className="text-sm">
          <span className="text-[var(--color-muted)]">Shown as: </span>
          <span data-testid="facility-preview">{preview}</span>
        </p>
      )}
      {values.timeZone !== saved.timeZone && (
        <p className="notice text-sm" role="note">
          Changing the zone moves every day's midnight: usage, waste and billing periods are counted again in the new zone, and the daily
          usage sums are rebuilt at once. Statements already issued keep their figures. Best done between billing periods.
        </p>
      )}
      <HydratedControls>
        <div className="flex items-center gap-3">
          <button className="btn" type="submit" disabled={busy}>
            {busy ? "Saving…" : "Save"}
          </button>
          {message && (
            <p role="status" className={message.ok ? "text-sm" : "field-error"}>
              {message.text}
            </p>
          )}
        </div>
      </HydratedControls>
    </IslandForm>
  );
}
