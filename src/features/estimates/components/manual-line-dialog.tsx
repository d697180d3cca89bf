import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { CATEGORY_LABELS, EstimateLimits, PRICE_CATEGORIES, PRICE_UNITS, PriceCategory, PriceUnit, type ManualLine } from "../../../../shared/schemas/estimates";
import { minorToPlain } from "../../../../shared/money";
import { Dialog } from "../../../components/ui/dialog";
import { SelectField, SubmitButton, TextField, secondaryButtonClass } from "../../../components/ui/form";
import { numberText, parseAmount, parseMarkup, parseQuantity, UNIT_CHOICES } from "../lib/format";

/** The form's fields as typed; amounts in major units ("12.50"). */
const lineForm = (currency: string) =>
  z
    .object({
      category: PriceCategory,
      description: z.string().trim().min(1, "description is required").max(EstimateLimits.descriptionMax, `description must be at most ${EstimateLimits.descriptionMax} characters`),
      quantity: z.string(),
      unit: PriceUnit,
      unitCost: z.string(),
      markup: z.string(),
    })
    .transform((values, ctx) => {
      const quantity = parseQuantity(values.quantity);
      if (!quantity.ok) ctx.addIssue({ code: "custom", path: ["quantity"], message: quantity.error });
      const cost = parseAmount(values.unitCost, currency, "unit cost");
      if (!cost.ok) ctx.addIssue({ code: "custom", path: ["unitCost"], message: cost.error });
      const markup = values.markup.trim() === "" ? ({ ok: true, value: null } as const) : parseMarkup(values.markup);
      if (!markup.ok) ctx.addIssue({ code: "custom", path: ["markup"], message: markup.error });
      if (!quantity.ok || !cost.ok || !markup.ok) return z.NEVER;
      return { category: values.category, description: values.description, quantity: quantity.value, unit: values.unit, unitCostMinor: cost.value, markupPercent: markup.value };
    });

type LineFormValues = z.input<ReturnType<typeof lineForm>>;
export type ManualLineValues = z.output<ReturnType<typeof lineForm>>;

interface ManualLineDialogProps {
  /** The line to edit; a new one without. */
  line?: ManualLine;
  currency: string;
  /** The estimate's markup, used when the line has none of its own. */
  defaultMarkupPercent: number;
  onSave: (values: ManualLineValues) => void;
  onClose: () => void;
}

/** Adds or edits a line by hand: category, description, quantity and unit, unit cost (major units), its own markup. */
export function ManualLineDialog({ line, currency, defaultMarkupPercent, onSave, onClose }: ManualLineDialogProps) {
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm<LineFormValues, unknown, ManualLineValues>({
    resolver: zodResolver(lineForm(currency)),
    defaultValues: {
      category: line?.category ?? "other",
      description: line?.description ?? "",
      quantity: line ? numberText(line.quantity) : "1",
      unit: line?.unit ?? "each",
      unitCost: line ? minorToPlain(line.unitCostMinor, currency) : "",
      markup: numberText(line?.markupPercent),
    },
  });

  return (
    <Dialog size="md" closeButton title={line ? "Edit line" : "Add a line"} description="A line of your own, priced from its cost with a markup." onClose={onClose}>
      <form noValidate onSubmit={handleSubmit(onSave)} className="space-y-4">
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField label="Category" error={errors.category?.message} {...register("category")}>
            {PRICE_CATEGORIES.map((c) => (
              <option key={c} value={c}>
                {CATEGORY_LABELS[c]}
              </option>
            ))}
          </SelectField>
          <TextField label="Description" maxLength={EstimateLimits.descriptionMax} autoComplete="off" className="sm:col-span-2" error={errors.description?.message} {...register("description")} />
          <TextField label="Quantity" inputMode="decimal" autoComplete="off" error={errors.quantity?.message} {...register("quantity")} />
          <SelectField label="Unit" error={errors.unit?.message} {...register("unit")}>
            {PRICE_UNITS.map((u) => (
              <option key={u} value={u}>
                {UNIT_CHOICES[u]}
              </option>
            ))}
          </SelectField>
          <TextField label={`Unit cost (${currency})`} inputMode="decimal" autoComplete="off" placeholder="0.00" error={errors.unitCost?.message} {...register("unitCost")} />
          <TextField
            label="Markup (%)"
            inputMode="decimal"
            autoComplete="off"
            placeholder={String(defaultMarkupPercent)}
            hint={`Empty: the estimate's markup (${defaultMarkupPercent} %).`}
            error={errors.markup?.message}
            {...register("markup")}
          />
        </div>
        <div className="flex flex-wrap justify-end gap-2">
          <button type="button" onClick={onClose} className={secondaryButtonClass}>
            Cancel
          </button>
          <SubmitButton pending={false}>{line ? "Save line" : "Add line"}</SubmitButton>
        </div>
      </form>
    </Dialog>
  );
}
