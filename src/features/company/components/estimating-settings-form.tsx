import { zodResolver } from "@hookform/resolvers/zod";
import { useRef, useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { EstimateLimits, UpdateEstimatingSettingsInput, type EstimatingSettings } from "../../../../shared/schemas/estimates";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { controlClass, dangerButtonClass, Field, FormAlert, FormStatus, secondaryButtonClass, SubmitButton, TextField } from "../../../components/ui/form";
import { LoadFailed } from "../../../components/ui/load-failed";
import { applyServerError } from "../../../lib/form-errors";
import { useDeleteLogo } from "../api/delete-logo";
import { useEstimatingSettings } from "../api/get-estimating-settings";
import { useUpdateEstimatingSettings } from "../api/update-estimating-settings";
import { logoHref, logoProblem, LOGO_TYPES, useUploadLogo } from "../api/upload-logo";

const S = UpdateEstimatingSettingsInput.shape;

// Figures are typed as text ("10", "1.5"): a plain decimal with a point, nothing else.
const DECIMAL = /^-?(\d+(\.\d*)?|\.\d+)$/;
const numberText = (field: string) =>
  z.string().trim().min(1, `${field} is required`).regex(DECIMAL, `${field} must be a number, such as 12.5`).transform(Number);

/** The form's fields are the shared UpdateEstimatingSettingsInput's, read from text. */
const EstimatingForm = z.object({
  wastePercent: numberText("waste").pipe(S.wastePercent.unwrap()),
  labourMinutesPerRun: numberText("minutes per run").pipe(S.labourMinutesPerRun.unwrap()),
  labourMinutesPerMetre: numberText("minutes per metre").pipe(S.labourMinutesPerMetre.unwrap()),
  labourMinutesPerTermination: numberText("minutes per termination").pipe(S.labourMinutesPerTermination.unwrap()),
  quoteValidDays: numberText("validity").pipe(S.quoteValidDays.unwrap()),
  quoteTerms: S.quoteTerms.unwrap(),
});
type EstimatingFormValues = z.input<typeof EstimatingForm>;
type EstimatingFormOutput = z.output<typeof EstimatingForm>;

const FIELDS = ["wastePercent", "labourMinutesPerRun", "labourMinutesPerMetre", "labourMinutesPerTermination", "quoteValidDays", "quoteTerms"] as const satisfies ReadonlyArray<
  keyof EstimatingFormValues
>;

const toFormValues = (settings: EstimatingSettings): EstimatingFormValues => ({
  wastePercent: String(settings.wastePercent),
  labourMinutesPerRun: String(settings.labourMinutesPerRun),
  labourMinutesPerMetre: String(settings.labourMinutesPerMetre),
  labourMinutesPerTermination: String(settings.labourMinutesPerTermination),
  quoteValidDays: String(settings.quoteValidDays),
  quoteTerms: settings.quoteTerms,
});

interface EstimatingSettingsFormProps {
  settings: EstimatingSettings;
  /** The Owner may change the settings; everyone else reads them. */
  canEdit: boolean;
}

/** Waste, labour minutes, quote validity and default terms: what every new estimate and quote starts from. */
export function EstimatingSettingsForm({ settings, canEdit }: EstimatingSettingsFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const update = useUpdateEstimatingSettings();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm<EstimatingFormValues, unknown, EstimatingFormOutput>({
    resolver: zodResolver(EstimatingForm),
    defaultValues: toFormValues(settings),
    disabled: !canEdit,
  });

  const onSubmit = handleSubmit((patch) => {
    setAlert(null);
    setSaved(false);
    update.mutate(patch, {
      onSuccess: (next) => {
        reset(toFormValues(next));
        setSaved(true);
      },
      onError: (error) => setAlert(applyServerError(error, setError, FIELDS)),
    });
  });

  const minutesField = (name: (typeof FIELDS)[number], label: string, hint: string) => (
    <TextField label={label} hint={hint} inputMode="decimal" autoComplete="off" error={errors[name]?.message} {...register(name)} />
  );

  return (
    <form noValidate onSubmit={onSubmit} className="mt-4 space-y-4">
      <FormAlert message={alert} />
      <fieldset className="grid gap-4 sm:grid-cols-3">
        <legend className="sr-only">Bill of materials</legend>
        <TextField
          label="Waste (%)"
          hint="Added to cable lengths for offcuts and routing."
          inputMode="decimal"
          autoComplete="off"
          error={errors.wastePercent?.message}
          {...register("wastePercent")}
        />
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-3">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Labour</legend>
        {minutesField("labourMinutesPerRun", "Minutes per run", "Setting up and pulling each run.")}
        {minutesField("labourMinutesPerMetre", "Minutes per metre of run", "Per metre of one-way run length.")}
        {minutesField("labourMinutesPerTermination", "Minutes per termination", "Each conductor end: strip, crimp, land.")}
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-3">
        <legend className="mb-2 text-sm font-semibold text-ink-900">Quotes</legend>
        <TextField
          label="Quote validity (days)"
          hint="How long the client has to accept a quote."
          inputMode="numeric"
          autoComplete="off"
          error={errors.quoteValidDays?.message}
          {...register("quoteValidDays")}
        />
        <Field label="Default terms" hint="Printed on every new quote; each quote's terms can still be changed." error={errors.quoteTerms?.message} className="sm:col-span-3">
          {(control) => <textarea rows={5} maxLength={EstimateLimits.termsMax} {...register("quoteTerms")} {...control} className={controlClass} />}
        </Field>
      </fieldset>
      {canEdit ? (
        <div className="flex flex-wrap items-center gap-4">
          <SubmitButton pending={update.isPending}>Save estimating settings</SubmitButton>
          <FormStatus message={saved ? "Estimating settings saved" : null} />
        </div>
      ) : null}
    </form>
  );
}

/** The logo that heads every quote: a preview, and for the Owner upload (PNG or JPEG, ≤ 512 KB) and remove. */
export function CompanyLogo({ hasLogo, canEdit }: { hasLogo: boolean; canEdit: boolean }) {
  const input = useRef<HTMLInputElement>(null);
  const upload = useUploadLogo();
  const remove = useDeleteLogo();
  // Changes after each upload so the browser fetches the new image instead of showing its cached one.
  const [version, setVersion] = useState(() => String(Date.now()));
  const [broken, setBroken] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [asking, setAsking] = useState(false);

  const send = (file: File) => {
    setStatus(null);
    const refused = logoProblem(file);
    setProblem(refused);
    if (refused) return;
    upload.mutate(file, {
      onSuccess: () => {
        setVersion((previous) => {
          const next = String(Date.now());
          return next === previous ? `${next}-1` : next;
        });
        setStatus("Logo saved");
      },
      onError: (failure) => setProblem(failure.message),
    });
  };

  const confirmRemove = () => {
    setStatus(null);
    setProblem(null);
    remove.mutate(undefined, {
      onSuccess: () => {
        setAsking(false);
        setStatus("Logo removed");
      },
      onError: (failure) => {
        setAsking(false);
        setProblem(failure.message);
      },
    });
  };

  const src = logoHref(version);
  return (
    <section aria-labelledby="logo-heading" className="mt-6 border-t border-ink-100 pt-4">
      <h3 id="logo-heading" className="text-sm font-semibold text-ink-900">
        Company logo
      </h3>
      <p className="mt-1 text-sm text-ink-600">It heads every quote and its PDF. PNG or JPEG, at most {EstimateLimits.logoMaxBytes / 1024} KB.</p>
      <div className="mt-3 flex flex-wrap items-center gap-4">
        <div className="flex h-20 w-48 items-center justify-center rounded-md border border-dashed border-ink-200 bg-ink-50 p-2">
          {hasLogo && broken !== src ? (
            <img src={src} alt="Company logo" className="max-h-full max-w-full object-contain" onError={() => setBroken(src)} />
          ) : (
            <span className="text-center text-xs text-ink-500">{hasLogo ? "The logo could not be shown." : "No logo: quotes carry the company name alone."}</span>
          )}
        </div>
        {canEdit ? (
          <div className="flex flex-wrap gap-2">
            <button type="button" disabled={upload.isPending || remove.isPending} onClick={() => input.current?.click()} className={secondaryButtonClass}>
              {upload.isPending ? "Uploading…" : hasLogo ? "Replace logo" : "Upload logo"}
            </button>
            <input
              ref={input}
              type="file"
              accept={LOGO_TYPES.join(",")}
              aria-label="Logo file"
              className="sr-only"
              tabIndex={-1}
              onChange={(event) => {
                const file = event.target.files?.[0];
                event.target.value = "";
                if (file) send(file);
              }}
            />
            {hasLogo ? (
              <button type="button" disabled={upload.isPending || remove.isPending} onClick={() => setAsking(true)} className={dangerButtonClass}>
                Remove logo
              </button>
            ) : null}
          </div>
        ) : null}
      </div>
      <FormAlert message={problem} className="mt-3" />
      <FormStatus message={status} className="mt-3" />
      {asking ? (
        <ConfirmDialog title="Remove the logo?" confirmLabel="Remove logo" pending={remove.isPending} onConfirm={confirmRemove} onCancel={() => setAsking(false)}>
          Quotes made from now on carry the company name alone; quotes already made keep the logo they were made with.
        </ConfirmDialog>
      ) : null}
    </section>
  );
}

/** Settings › "Estimating and quotes": loads the settings, then the form and the logo (editable for the Owner). */
export function EstimatingSettingsSection({ canEdit }: { canEdit: boolean }) {
  const { data, error, isPending, isFetching, refetch } = useEstimatingSettings();
  let body;
  if (isPending) body = <p className="mt-4 text-sm text-ink-500">Loading estimating settings…</p>;
  else if (error) {
    body = (
      <LoadFailed
        className="mt-4"
        message={`The estimating settings could not be loaded. ${error.message}`}
        retrying={isFetching}
        onRetry={() => void refetch()}
      />
    );
  } else {
    body = (
      <>
        <EstimatingSettingsForm settings={data} canEdit={canEdit} />
        <CompanyLogo hasLogo={data.hasLogo} canEdit={canEdit} />
      </>
    );
  }
  return (
    <section aria-labelledby="estimating-heading" className="mt-6 max-w-3xl rounded-lg border border-ink-100 bg-white p-4 sm:p-6">
      <h2 id="estimating-heading" className="text-base font-semibold text-ink-900">
        Estimating and quotes
      </h2>
      <p className="mt-1 text-sm text-ink-500">
        {canEdit
          ? "What every new estimate and quote starts from."
          : "What every new estimate and quote starts from. Only the company's Owner can change these; you can read them here."}
      </p>
      {body}
    </section>
  );
}
