import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { minorDigits, UpdateCompanyInput, type CompanySettings } from "../../../../shared/schemas/company";
import { controlClass, Field, FormAlert, FormStatus, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { useUpdateCompany } from "../api/update-company";

const S = UpdateCompanyInput.shape;

// Figures are typed as text ("85.00", "8.25"): a plain decimal with a point, nothing else.
const DECIMAL = /^-?(\d+(\.\d*)?|\.\d+)$/;
const numberText = (field: string) =>
  z.string().trim().min(1, `${field} is required`).regex(DECIMAL, `${field} must be a number, such as 12.5`).transform(Number);

/**
 * The form's fields are the shared UpdateCompanyInput's, read from text. The labour rate
 * is typed in major units of the chosen currency and sent in minor units (cents).
 */
const CompanyForm = z
  .object({
    name: S.name.unwrap(),
    licenceNumber: S.licenceNumber.unwrap(),
    contactEmail: S.contactEmail.unwrap(),
    phone: S.phone.unwrap(),
    address: S.address.unwrap(),
    currency: S.currency.unwrap(),
    taxRatePercent: numberText("tax rate").pipe(S.taxRatePercent.unwrap()),
    defaultMarkupPercent: numberText("default markup").pipe(S.defaultMarkupPercent.unwrap()),
    labourRate: numberText("labour rate"),
    depositPercent: numberText("deposit").pipe(S.depositPercent.unwrap()),
  })
  .transform(({ labourRate, ...rest }, ctx): UpdateCompanyInput => {
    const scale = 10 ** minorDigits(rest.currency);
    const labourRateMinor = Math.round(labourRate * scale);
    if (Math.abs(labourRate * scale - labourRateMinor) > 1e-6) {
      ctx.issues.push({ code: "custom", path: ["labourRate"], message: `labour rate has more decimals than ${rest.currency} uses`, input: labourRate });
      return z.NEVER;
    }
    const checked = S.labourRateMinor.unwrap().safeParse(labourRateMinor);
    if (!checked.success) {
      ctx.issues.push({ code: "custom", path: ["labourRate"], message: checked.error.issues[0]?.message ?? "labour rate is not valid", input: labourRate });
      return z.NEVER;
    }
    return { ...rest, labourRateMinor };
  });
type CompanyFormValues = z.input<typeof CompanyForm>;

const FIELDS = [
  "name",
  "licenceNumber",
  "contactEmail",
  "phone",
  "address",
  "currency",
  "taxRatePercent",
  "defaultMarkupPercent",
  "labourRate",
  "depositPercent",
] as const satisfies ReadonlyArray<keyof CompanyFormValues>;

function toFormValues(company: CompanySettings): CompanyFormValues {
  const digits = minorDigits(company.currency);
  return {
    name: company.name,
    licenceNumber: company.licenceNumber ?? "",
    contactEmail: company.contactEmail ?? "",
    phone: company.phone ?? "",
    address: company.address ?? "",
    currency: company.currency,
    taxRatePercent: String(company.taxRatePercent),
    defaultMarkupPercent: String(company.defaultMarkupPercent),
    labourRate: (company.labourRateMinor / 10 ** digits).toFixed(digits),
    depositPercent: String(company.depositPercent),
  };
}

interface CompanySettingsFormProps {
  company: CompanySettings;
  /** The Owner may change the settings; everyone else sees them read-only. */
  canEdit: boolean;
  onSaved?: (company: CompanySettings) => void;
}

export function CompanySettingsForm({ company, canEdit, onSaved }: CompanySettingsFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const update = useUpdateCompany();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    watch,
    formState: { errors },
  } = useForm<CompanyFormValues, unknown, UpdateCompanyInput>({
    resolver: zodResolver(CompanyForm),
    defaultValues: toFormValues(company),
    // Every input disabled for those who may only read.
    disabled: !canEdit,
  });

  const typedCurrency = (watch("currency") ?? "").trim().toUpperCase();
  const currency = /^[A-Z]{3}$/.test(typedCurrency) ? typedCurrency : company.currency;

  const onSubmit = handleSubmit((patch) => {
    setAlert(null);
    setSaved(false);
    update.mutate(patch, {
      onSuccess: (next) => {
        reset(toFormValues(next));
        setSaved(true);
        onSaved?.(next);
      },
      onError: (error) => setAlert(applyServerError(error, setError, FIELDS, { labourRateMinor: "labourRate" })),
    });
  });

  return (
    <section aria-labelledby="company-heading" className="mt-6 max-w-3xl rounded-lg border border-ink-100 bg-white p-4 sm:p-6">
      <h2 id="company-heading" className="text-base font-semibold text-ink-900">
        Company
      </h2>
      {canEdit ? null : (
        <p className="mt-1 text-sm text-ink-500">Only the company's Owner can change these settings; you can read them here.</p>
      )}
      <form noValidate onSubmit={onSubmit} className="mt-4 space-y-4">
        <FormAlert message={alert} />
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="sr-only">Company settings</legend>
          <TextField label="Company name" autoComplete="organization" error={errors.name?.message} {...register("name")} />
          <TextField label="Licence number" autoComplete="off" error={errors.licenceNumber?.message} {...register("licenceNumber")} />
          <TextField label="Contact e-mail" type="email" autoComplete="email" inputMode="email" error={errors.contactEmail?.message} {...register("contactEmail")} />
          <TextField label="Phone" type="tel" autoComplete="tel" error={errors.phone?.message} {...register("phone")} />
          <Field label="Address" error={errors.address?.message} className="sm:col-span-2">
            {(control) => <textarea rows={3} autoComplete="street-address" {...register("address")} {...control} className={controlClass} />}
          </Field>
          <TextField
            label="Currency"
            hint="Three-letter code, such as USD, EUR or AUD."
            autoComplete="off"
            maxLength={3}
            spellCheck={false}
            className="sm:col-span-2 sm:max-w-48"
            error={errors.currency?.message}
            {...register("currency")}
          />
          <TextField label="Tax rate (%)" inputMode="decimal" autoComplete="off" error={errors.taxRatePercent?.message} {...register("taxRatePercent")} />
          <TextField
            label="Default markup (%)"
            hint="Added to your costs to give sell prices."
            inputMode="decimal"
            autoComplete="off"
            error={errors.defaultMarkupPercent?.message}
            {...register("defaultMarkupPercent")}
          />
          <Field label="Labour rate per hour" hint={`In ${currency}.`} error={errors.labourRate?.message}>
            {(control) => (
              <div className="flex items-center gap-2">
                <input type="text" inputMode="decimal" autoComplete="off" {...register("labourRate")} {...control} className={controlClass} />
                <span aria-hidden="true" className="text-sm font-medium text-ink-600">
                  {currency}
                </span>
              </div>
            )}
          </Field>
          <TextField
            label="Deposit (%)"
            hint="Share of the quote asked for when the client accepts."
            inputMode="decimal"
            autoComplete="off"
            error={errors.depositPercent?.message}
            {...register("depositPercent")}
          />
        </fieldset>
        {canEdit ? (
          <div className="flex flex-wrap items-center gap-4">
            <SubmitButton pending={update.isPending}>Save settings</SubmitButton>
            <FormStatus message={saved ? "Settings saved" : null} />
          </div>
        ) : null}
      </form>
    </section>
  );
}
