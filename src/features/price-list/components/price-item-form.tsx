import { zodResolver } from "@hookform/resolvers/zod";
import { useMemo, useState } from "react";
import { useForm, type Path } from "react-hook-form";
import { z } from "zod";
import { minorToPlain, parseMoney } from "../../../../shared/money";
import {
  CATEGORY_LABELS,
  EstimateLimits,
  PRICE_CATEGORIES,
  PRICE_UNITS,
  PriceCategory,
  PriceItemInput,
  PriceUnit,
  type PriceItem,
  type PriceItemValues,
} from "../../../../shared/schemas/estimates";
import { Field, FormAlert, SelectField, controlClass, secondaryButtonClass, SubmitButton, TextField } from "../../../components/ui/form";
import { applyServerError } from "../../../lib/form-errors";
import { formatSize } from "../../system-editor/lib/format";
import { useCreatePriceItem } from "../api/create-price-item";
import { useUpdatePriceItem } from "../api/update-price-item";
import { MATERIAL_LABELS, UNIT_LABELS } from "./price-item-text";

/** What a link from the estimate's missing-price finding fills in (?add=cable&size=16 mm2&material=copper). */
export interface PriceItemPreset {
  category: PriceCategory;
  cableSize?: string;
  cableMaterial?: "copper" | "aluminum";
  ratingA?: number;
}

/** The form holds text; figures and money are read from it and the result must pass the shared PriceItemInput. */
export interface PriceItemFormValues {
  sku: string;
  description: string;
  category: PriceCategory;
  unit: PriceUnit;
  unitCost: string;
  sellPrice: string;
  cableSize: string;
  cableMaterial: "" | "copper" | "aluminum";
  conductors: "1" | "2";
  ratingA: string;
}

const DECIMAL = /^(\d+(\.\d*)?|\.\d+)$/;

/** The fields each category shows beside SKU, description, category, unit and prices. */
const CATEGORY_FIELDS: Record<PriceCategory, ReadonlyArray<"cableSize" | "cableMaterial" | "conductors" | "ratingA">> = {
  cable: ["cableSize", "cableMaterial", "conductors"],
  termination: ["cableSize"],
  fuse: ["ratingA"],
  device: [],
  labour: [],
  other: [],
};

const COMMON_FIELDS = ["sku", "description", "category", "unit", "unitCost", "sellPrice"] as const;
const visibleFields = (category: PriceCategory): Path<PriceItemFormValues>[] => [...COMMON_FIELDS, ...CATEGORY_FIELDS[category]];

/** The API's money fields are edited as major-unit text. */
const API_TO_FORM: Record<string, keyof PriceItemFormValues> = { unitCostMinor: "unitCost", sellPriceMinor: "sellPrice" };

/** The unit a category starts with when it is chosen (cable is sold by length, labour by the hour). */
function unitFor(category: PriceCategory, current: PriceUnit): PriceUnit {
  if (category === "cable") return current === "m" || current === "ft" ? current : "m";
  if (category === "labour") return "hour";
  if (category === "other") return current;
  return "each";
}

/** Text → PriceItemInput's output, with every problem on the field that shows it. */
export function priceItemFormSchema(currency: string) {
  return z
    .object({
      sku: z.string(),
      description: z.string(),
      category: PriceCategory,
      unit: PriceUnit,
      unitCost: z.string(),
      sellPrice: z.string(),
      cableSize: z.string(),
      cableMaterial: z.enum(["", "copper", "aluminum"]),
      conductors: z.enum(["1", "2"]),
      ratingA: z.string(),
    })
    .transform((form, ctx): PriceItemValues => {
      const problems = new Set<string>();
      const problem = (field: keyof PriceItemFormValues | "root", message: string) => {
        if (problems.has(field)) return;
        problems.add(field);
        ctx.issues.push({ code: "custom", path: [field], message, input: field === "root" ? form : form[field] });
      };
      const money = (field: "unitCost" | "sellPrice", words: string): number | null => {
        const text = form[field].trim();
        if (text === "") return null;
        const minor = parseMoney(text, currency);
        if (minor === null) problem(field, `${words} must be an amount in ${currency}, such as 12.50`);
        return minor;
      };

      const unitCostMinor = money("unitCost", "unit cost");
      if (form.unitCost.trim() === "") problem("unitCost", "unit cost is required");
      const sellPriceMinor = money("sellPrice", "sell price");

      const shown = new Set(CATEGORY_FIELDS[form.category]);
      let ratingA: number | null = null;
      if (shown.has("ratingA") && form.ratingA.trim() !== "") {
        if (DECIMAL.test(form.ratingA.trim())) ratingA = Number(form.ratingA.trim());
        else problem("ratingA", "rating must be a number of amperes, such as 30");
      }

      // Fields the category does not show are sent empty, so a value left from another category never goes.
      const candidate = {
        sku: form.sku,
        description: form.description,
        category: form.category,
        unit: form.unit,
        unitCostMinor: unitCostMinor ?? 0,
        sellPriceMinor,
        cableSize: shown.has("cableSize") && form.cableSize.trim() !== "" ? form.cableSize : null,
        cableMaterial: shown.has("cableMaterial") && form.cableMaterial !== "" ? form.cableMaterial : null,
        conductors: shown.has("conductors") ? Number(form.conductors) : null,
        ratingA,
      };
      const checked = PriceItemInput.safeParse(candidate);
      if (!checked.success) {
        for (const issue of checked.error.issues) {
          const key = String(issue.path[0] ?? "");
          const field = API_TO_FORM[key] ?? key;
          problem(field in form ? (field as keyof PriceItemFormValues) : "root", issue.message);
        }
      }
      if (problems.size > 0 || !checked.success) return z.NEVER;
      return checked.data;
    });
}

function toValues(currency: string, item?: PriceItem, preset?: PriceItemPreset): PriceItemFormValues {
  if (item) {
    return {
      sku: item.sku,
      description: item.description,
      category: item.category,
      unit: item.unit,
      unitCost: minorToPlain(item.unitCostMinor, currency),
      sellPrice: item.sellPriceMinor === null ? "" : minorToPlain(item.sellPriceMinor, currency),
      cableSize: item.cableSize ? formatSize(item.cableSize) : "",
      cableMaterial: item.cableMaterial ?? "",
      conductors: item.conductors === 2 ? "2" : "1",
      ratingA: item.ratingA === null ? "" : String(item.ratingA),
    };
  }
  const category = preset?.category ?? "cable";
  const size = preset?.cableSize ? formatSize(preset.cableSize) : "";
  let description = "";
  if (preset && category === "cable" && size && preset.cableMaterial) description = `${size} ${MATERIAL_LABELS[preset.cableMaterial].toLowerCase()} cable`;
  if (preset && category === "fuse" && preset.ratingA !== undefined) description = `${preset.ratingA} A fuse`;
  return {
    sku: "",
    description,
    category,
    unit: unitFor(category, "each"),
    unitCost: "",
    sellPrice: "",
    cableSize: size,
    cableMaterial: preset?.cableMaterial ?? (category === "cable" ? "copper" : ""),
    conductors: "1",
    ratingA: preset?.ratingA === undefined ? "" : String(preset.ratingA),
  };
}

interface PriceItemFormProps {
  /** The item to edit; a new one without. */
  item?: PriceItem;
  /** Starting values of a new item. */
  preset?: PriceItemPreset;
  /** The company's currency: prices are typed in its major units. */
  currency: string;
  onSaved: (item: PriceItem) => void;
  onCancel: () => void;
}

/** SKU, description, category and its own fields (size, material, conductors; size; rating), unit, cost and sell price. */
export function PriceItemForm({ item, preset, currency, onSaved, onCancel }: PriceItemFormProps) {
  const [alert, setAlert] = useState<string | null>(null);
  const create = useCreatePriceItem();
  const update = useUpdatePriceItem();
  const pending = create.isPending || update.isPending;
  const schema = useMemo(() => priceItemFormSchema(currency), [currency]);
  const {
    register,
    handleSubmit,
    setError,
    setValue,
    getValues,
    watch,
    formState: { errors },
  } = useForm<PriceItemFormValues, unknown, PriceItemValues>({ resolver: zodResolver(schema), defaultValues: toValues(currency, item, preset) });

  const category = watch("category");
  const shown = new Set(CATEGORY_FIELDS[category]);

  const onSubmit = handleSubmit((values) => {
    setAlert(null);
    const onError = (error: Error) => setAlert(applyServerError(error, setError, visibleFields(values.category), API_TO_FORM));
    if (item) update.mutate({ itemId: item.id, patch: values }, { onSuccess: onSaved, onError });
    else create.mutate(values, { onSuccess: onSaved, onError });
  });

  const moneyField = (name: "unitCost" | "sellPrice", label: string, hint?: string) => (
    <Field label={label} hint={hint} error={errors[name]?.message}>
      {(control) => (
        <div className="flex items-center gap-2">
          <input type="text" inputMode="decimal" autoComplete="off" placeholder="0.00" {...register(name)} {...control} className={`${controlClass} text-right tabular-nums`} />
          <span aria-hidden="true" className="text-sm font-medium text-ink-600">
            {currency}
          </span>
        </div>
      )}
    </Field>
  );

  return (
    <form noValidate onSubmit={onSubmit} className="space-y-4">
      <FormAlert message={alert ?? errors.root?.message} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="SKU" autoComplete="off" spellCheck={false} maxLength={EstimateLimits.skuMax} error={errors.sku?.message} {...register("sku")} />
        <SelectField
          label="Category"
          error={errors.category?.message}
          {...register("category", { onChange: (event) => setValue("unit", unitFor(event.target.value as PriceCategory, getValues("unit"))) })}
        >
          {PRICE_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Description"
          autoComplete="off"
          maxLength={EstimateLimits.descriptionMax}
          hint="As it reads on the estimate and the quote."
          className="sm:col-span-2"
          error={errors.description?.message}
          {...register("description")}
        />
        {shown.has("cableSize") ? (
          <TextField
            label="Conductor size"
            autoComplete="off"
            spellCheck={false}
            hint={category === "cable" ? "Such as 16 mm2, 10 AWG, 2/0 AWG or 250 kcmil." : "The conductor size it fits; leave empty for one that fits any size."}
            error={errors.cableSize?.message}
            {...register("cableSize")}
          />
        ) : null}
        {shown.has("cableMaterial") ? (
          <SelectField label="Material" error={errors.cableMaterial?.message} {...register("cableMaterial")}>
            <option value="">Choose…</option>
            <option value="copper">{MATERIAL_LABELS.copper}</option>
            <option value="aluminum">{MATERIAL_LABELS.aluminum}</option>
          </SelectField>
        ) : null}
        {shown.has("conductors") ? (
          <SelectField
            label="Conductors"
            hint="Twin cable carries both conductors of a run, so a run needs half the length."
            error={errors.conductors?.message}
            {...register("conductors")}
          >
            <option value="1">1 (single)</option>
            <option value="2">2 (twin)</option>
          </SelectField>
        ) : null}
        {shown.has("ratingA") ? (
          <TextField
            label="Rating (A)"
            inputMode="decimal"
            autoComplete="off"
            hint="Leave empty for a fuse holder."
            error={errors.ratingA?.message}
            {...register("ratingA")}
          />
        ) : null}
        <SelectField label="Unit" error={errors.unit?.message} {...register("unit")}>
          {/* Every unit stays in the list (setValue on a category change needs its option); cable is sold by length only. */}
          {PRICE_UNITS.map((u) => (
            <option key={u} value={u} disabled={category === "cable" && u !== "m" && u !== "ft"}>
              {UNIT_LABELS[u]}
            </option>
          ))}
        </SelectField>
        {moneyField("unitCost", "Unit cost", "What you pay, per unit.")}
        {moneyField("sellPrice", "Sell price", "Optional: when set, estimates use it instead of cost plus markup.")}
      </div>
      <div className="flex flex-wrap justify-end gap-2">
        <button type="button" onClick={onCancel} disabled={pending} className={secondaryButtonClass}>
          Cancel
        </button>
        <SubmitButton pending={pending}>{item ? "Save item" : "Add item"}</SubmitButton>
      </div>
    </form>
  );
}
