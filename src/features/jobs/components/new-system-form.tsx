import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { DEFAULT_LIMIT_PROFILE } from "../../../../shared/engine/schema";
import { CreateSystemInput, JobLimits, type SystemRecord } from "../../../../shared/schemas/jobs";
import { FormAlert, secondaryButtonClass, SelectField, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { ALL_LIMIT_PROFILES, useLimitProfiles } from "../../limit-profiles/api/get-limit-profiles";
import { useCreateSystem } from "../api/create-system";

const { branchPercent, totalPercent, criticalPercent } = DEFAULT_LIMIT_PROFILE;
/** What a system without a profile is checked against (the engine's default). */
export const DEFAULT_PROFILE_LABEL = `Default: ${branchPercent} % branch, ${totalPercent} % total, ${criticalPercent} % critical`;

const DECIMAL = /^(\d+(\.\d*)?|\.\d+)$/;
const VOLTAGE_CHOICES = ["12", "24", "48"] as const;

/** What the form holds (all text), turned into the shared CreateSystemInput on submit. */
const SystemForm = z
  .object({
    name: z.string(),
    voltageChoice: z.enum([...VOLTAGE_CHOICES, "other"]),
    otherVoltage: z.string(),
    units: z.enum(["metric", "imperial"]),
    limitProfileId: z.string(),
  })
  .transform((values, ctx) => {
    const other = values.voltageChoice === "other";
    const typed = values.otherVoltage.trim();
    const voltageTyped = !other || DECIMAL.test(typed);
    if (!voltageTyped) ctx.issues.push({ code: "custom", path: ["otherVoltage"], message: "nominal voltage must be a number of volts, such as 36", input: typed });
    // Every other field is still checked when the voltage is not a number (24 V stands in for it).
    const checked = CreateSystemInput.safeParse({
      name: values.name,
      nominalVoltage: !voltageTyped ? 24 : other ? Number(typed) : Number(values.voltageChoice),
      units: values.units,
      limitProfileId: values.limitProfileId === "" ? null : values.limitProfileId,
    });
    if (!checked.success) {
      for (const issue of checked.error.issues) {
        const field = issue.path[0] === "nominalVoltage" ? (other ? "otherVoltage" : "voltageChoice") : String(issue.path[0] ?? "name");
        ctx.issues.push({ code: "custom", path: [field], message: issue.message, input: values });
      }
    }
    if (!checked.success || !voltageTyped) return z.NEVER;
    return checked.data;
  });
type SystemFormValues = z.input<typeof SystemForm>;
type SystemFormOutput = z.output<typeof SystemForm>;
const FIELDS = ["name", "voltageChoice", "otherVoltage", "units", "limitProfileId"] as const;

interface NewSystemFormProps {
  jobId: string;
  /** Units the form starts with (the job's other systems', usually). */
  defaultUnits?: "metric" | "imperial";
  onCreated: (system: SystemRecord) => void;
  onCancel: () => void;
}

/** Name, nominal voltage, units and limit profile → POST /api/jobs/:jobId/systems. */
export function NewSystemForm({ jobId, defaultUnits = "metric", onCreated, onCancel }: NewSystemFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const create = useCreateSystem();
  const profiles = useLimitProfiles(ALL_LIMIT_PROFILES);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    getValues,
    watch,
    formState: { errors },
  } = useForm<SystemFormValues, unknown, SystemFormOutput>({
    resolver: zodResolver(SystemForm),
    defaultValues: { name: "", voltageChoice: "24", otherVoltage: "", units: defaultUnits, limitProfileId: "" },
  });
  const other = watch("voltageChoice") === "other";
  // New systems start on the company's first built-in profile (General), as the server would choose.
  const firstBuiltIn = profiles.data?.items.find((p) => p.builtIn)?.id;
  useEffect(() => {
    if (firstBuiltIn && getValues("limitProfileId") === "") setValue("limitProfileId", firstBuiltIn);
  }, [firstBuiltIn, getValues, setValue]);

  const onSubmit = handleSubmit((input) => {
    setAlert(null);
    create.mutate(
      { jobId, input },
      {
        onSuccess: onCreated,
        onError: (error) => setAlert(applyServerError(error, setError, FIELDS, { nominalVoltage: other ? "otherVoltage" : "voltageChoice" })),
      },
    );
  });

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert} />
      <TextField label="System name" autoComplete="off" maxLength={JobLimits.systemNameMax} placeholder="House bank and well pump" error={errors.name?.message} {...register("name")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField label="Nominal voltage" error={errors.voltageChoice?.message} {...register("voltageChoice")}>
          {VOLTAGE_CHOICES.map((v) => (
            <option key={v} value={v}>
              {v} V
            </option>
          ))}
          <option value="other">Other…</option>
        </SelectField>
        {other ? (
          <TextField label="Other nominal voltage (V)" inputMode="decimal" autoComplete="off" error={errors.otherVoltage?.message} {...register("otherVoltage")} />
        ) : null}
        <SelectField label="Units" hint="Lengths and conductor sizes in the editor." error={errors.units?.message} {...register("units")}>
          <option value="metric">Metric (m, mm²)</option>
          <option value="imperial">Imperial (ft, AWG)</option>
        </SelectField>
      </div>
      <SelectField
        label="Limit profile"
        hint={profiles.error ? `The company's profiles could not be loaded (${profiles.error.message}); the default applies.` : "The drop limits every load is checked against."}
        disabled={profiles.isPending}
        error={errors.limitProfileId?.message}
        {...register("limitProfileId")}
      >
        <option value="">{DEFAULT_PROFILE_LABEL}</option>
        {profiles.data?.items.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name} ({p.branchPercent} % branch, {p.totalPercent} % total)
          </option>
        ))}
      </SelectField>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={create.isPending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={create.isPending}>Create system</SubmitButton>
      </div>
    </form>
  );
}
