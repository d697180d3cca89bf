import { RowActions } from "../../../components/ui/row-actions";
import { useEffect, useMemo, useState } from "react";
import { formatMoney } from "../../../../shared/money";
import { CATEGORY_LABELS, PRICE_CATEGORIES, PriceCategory, type PriceItem } from "../../../../shared/schemas/estimates";
import { ConfirmDialog } from "../../../components/ui/confirm-dialog";
import { Dialog } from "../../../components/ui/dialog";
import { EmptyState } from "../../../components/ui/empty-state";
import { controlClass, FormAlert, FormStatus, primaryButtonClass, secondaryButtonClass } from "../../../components/ui/form";
import { TagIcon } from "../../../components/ui/icons";
import { PlainHeader, SearchInput, SortHeader } from "../../../components/ui/list-controls";
import { LoadFailed } from "../../../components/ui/load-failed";
import { cn } from "../../../utils/cn";
import { sortValues, useListParams } from "../../jobs/hooks/use-list-params";
import { RowCapNote, useRowCap } from "../../system-editor/components/row-cap";
import { formatSize } from "../../system-editor/lib/format";
import { useDeletePriceItem } from "../api/delete-price-item";
import { usePriceList } from "../api/get-price-list";
import { PRICE_LIST_EXPORT_HREF } from "../api/import-price-list";
import { PriceItemForm, type PriceItemPreset } from "./price-item-form";
import { PriceListImport, RefusedRows, type ImportNotice } from "./price-list-import";
import { itemSpec, MATERIAL_LABELS, UNIT_LABELS } from "./price-item-text";

const cellClass = "px-3 py-1.5 align-middle";
const SORT_FIELDS = ["sku", "description", "cost"] as const;
const SORTS = sortValues(SORT_FIELDS);
const DEFAULT_SORT = "sku";
/** The address parameters a missing-price link fills the add form from. */
const PRESET_PARAMS = ["add", "size", "material", "rating"] as const;

type Editing = { mode: "new"; preset?: PriceItemPreset } | { mode: "edit"; item: PriceItem } | null;

const byText = (a: string, b: string) => a.localeCompare(b, "en", { numeric: true, sensitivity: "base" });

function sortItems(items: readonly PriceItem[], sort: string): PriceItem[] {
  const field = sort.replace(/^-/, "");
  const sign = sort.startsWith("-") ? -1 : 1;
  const compare = (a: PriceItem, b: PriceItem) => {
    if (field === "description") return byText(a.description, b.description) || byText(a.sku, b.sku);
    if (field === "cost") return a.unitCostMinor - b.unitCostMinor || byText(a.sku, b.sku);
    return byText(a.sku, b.sku);
  };
  return [...items].sort((a, b) => sign * compare(a, b));
}

/** The add form's starting values from ?add=<category>&size=&material=&rating= (null when `add` is not a category). */
function presetFrom(params: URLSearchParams): PriceItemPreset | null {
  const category = PriceCategory.safeParse(params.get("add"));
  if (!category.success) return null;
  const size = params.get("size")?.trim();
  const material = params.get("material");
  const rating = Number(params.get("rating"));
  return {
    category: category.data,
    ...(size ? { cableSize: size.slice(0, 40) } : {}),
    ...(material === "copper" || material === "aluminum" ? { cableMaterial: material } : {}),
    ...(params.get("rating") && Number.isFinite(rating) && rating > 0 ? { ratingA: rating } : {}),
  };
}

/** "16 mm² copper cable", "a 30 A fuse": what a missing-price link asks for, in words. */
function presetWords(preset: PriceItemPreset): string {
  if (preset.category === "cable") {
    return [preset.cableSize ? formatSize(preset.cableSize) : null, preset.cableMaterial ? MATERIAL_LABELS[preset.cableMaterial].toLowerCase() : null, "cable"].filter(Boolean).join(" ");
  }
  if (preset.category === "fuse") return preset.ratingA ? `a ${preset.ratingA} A fuse` : "a fuse holder";
  if (preset.category === "termination") return preset.cableSize ? `terminations for ${formatSize(preset.cableSize)}` : "terminations";
  return CATEGORY_LABELS[preset.category].toLowerCase();
}

/** The company's prices: search, category and sort from the address; Owners and Estimators add, edit, delete and import. */
export function PriceList({ canWrite }: { canWrite: boolean }) {
  const { params, sort, search, update } = useListParams({ sorts: SORTS, defaultSort: DEFAULT_SORT });
  const categoryParam = PriceCategory.safeParse(params.get("category"));
  const category = categoryParam.success ? categoryParam.data : null;
  const { data, error, isPending, isFetching, refetch } = usePriceList();
  const remove = useDeletePriceItem();
  const [editing, setEditing] = useState<Editing>(null);
  const [deleting, setDeleting] = useState<PriceItem | null>(null);
  const [alert, setAlert] = useState<string | null>(null);
  const [readOnlyAsk, setReadOnlyAsk] = useState<string | null>(null);
  const [importNotice, setImportNotice] = useState<ImportNotice | null>(null);

  // A link from an estimate's missing price opens the add form filled in, once: the parameters
  // leave the address so closing the form (or reloading) does not open it again.
  const addParam = params.get("add");
  useEffect(() => {
    if (addParam === null) return;
    const preset = presetFrom(params);
    if (preset && canWrite) setEditing({ mode: "new", preset });
    if (preset && !canWrite) setReadOnlyAsk(presetWords(preset));
    update(Object.fromEntries(PRESET_PARAMS.map((name) => [name, null])), { replace: true });
  }, [addParam, params, canWrite, update]);

  const needle = search.toLowerCase();
  const rows = useMemo(() => {
    if (!data) return [];
    const matching = data.items.filter(
      (item) =>
        (category === null || item.category === category) &&
        (needle === "" || [item.sku, item.description, itemSpec(item), item.cableSize ?? ""].some((text) => text.toLowerCase().includes(needle))),
    );
    return sortItems(matching, sort);
  }, [data, category, needle, sort]);
  const cap = useRowCap(rows, null);

  const openNew = () => {
    setAlert(null);
    setEditing({ mode: "new" });
  };

  const confirmDelete = () => {
    if (!deleting) return;
    setAlert(null);
    remove.mutate(deleting.id, {
      onSuccess: () => setDeleting(null),
      onError: (failure) => {
        setDeleting(null);
        setAlert(failure.message);
      },
    });
  };

  const addButton = canWrite ? (
    <button type="button" onClick={openNew} className={primaryButtonClass}>
      Add item
    </button>
  ) : null;
  const hasAny = (data?.items.length ?? 0) > 0;
  const filtered = Boolean(search) || category !== null;

  let body;
  if (isPending) {
    body = <p className="text-sm text-ink-500">Loading the price list…</p>;
  } else if (error && !data) {
    body = <LoadFailed message={`The price list could not be loaded. ${error.message}`} retrying={isFetching} onRetry={() => void refetch()} />;
  } else if (data && !hasAny) {
    body = (
      <EmptyState title="Your price list is empty" icon={<TagIcon />} action={addButton}>
        Cable by size and material, fuses and holders, lugs and terminations, devices and labour rates belong here. Auto-sizing only proposes cable
        sizes that have a price, so the quote never carries a silent zero.
        {canWrite ? " Add items one by one, or import a CSV with the columns the export gives." : null}
      </EmptyState>
    );
  } else if (data && rows.length === 0) {
    body = (
      <div className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-8 text-center text-sm text-ink-600">
        <p>
          No items match{search ? ` “${search}”` : ""}
          {category ? ` in ${CATEGORY_LABELS[category]}` : ""}.{" "}
          <button type="button" onClick={() => update({ search: null, category: null })} className="font-medium text-copper-700 underline underline-offset-2">
            Show every item
          </button>
        </p>
      </div>
    );
  } else if (data) {
    const money = (minor: number) => formatMoney(minor, data.currency);
    body = (
      <div className="space-y-2">
        {error ? <FormAlert message={`The list could not be refreshed. ${error.message}`} /> : null}
        <div className="overflow-x-auto rounded-lg border border-ink-100 bg-white">
          <table className="min-w-full text-left text-sm">
            <caption className="sr-only">Price list</caption>
            <thead className="border-b border-ink-100 bg-ink-50 text-xs font-semibold text-ink-500">
              <tr>
                <SortHeader label="SKU" field="sku" sort={sort} onSort={(s) => update({ sort: s })} />
                <SortHeader label="Description" field="description" sort={sort} onSort={(s) => update({ sort: s })} />
                <PlainHeader>Category</PlainHeader>
                <PlainHeader>Size or rating</PlainHeader>
                <PlainHeader>Unit</PlainHeader>
                <SortHeader label="Unit cost" field="cost" sort={sort} onSort={(s) => update({ sort: s })} className="text-right" />
                <PlainHeader className="text-right">Sell price</PlainHeader>
                {canWrite ? (
                  <th scope="col" className={cellClass}>
                    <span className="sr-only">Actions</span>
                  </th>
                ) : null}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {cap.shown.map((item) => (
                <tr key={item.id}>
                  <th scope="row" id={`price-${item.id}`} className={cn(cellClass, "whitespace-nowrap font-medium text-ink-900")}>
                    {item.sku}
                  </th>
                  <td className={cn(cellClass, "min-w-40 text-ink-800")}>{item.description}</td>
                  <td className={cn(cellClass, "text-ink-700")}>{CATEGORY_LABELS[item.category]}</td>
                  <td className={cn(cellClass, "whitespace-nowrap text-ink-700")}>{itemSpec(item) || <span className="text-ink-400">—</span>}</td>
                  <td className={cn(cellClass, "whitespace-nowrap text-ink-700")}>{UNIT_LABELS[item.unit]}</td>
                  <td className={cn(cellClass, "whitespace-nowrap text-right tabular-nums text-ink-900")}>{money(item.unitCostMinor)}</td>
                  <td className={cn(cellClass, "whitespace-nowrap text-right tabular-nums text-ink-900")}>
                    {item.sellPriceMinor === null ? <span className="text-ink-400">—</span> : money(item.sellPriceMinor)}
                  </td>
                  {canWrite ? (
                    <td className={cn(cellClass, "whitespace-nowrap text-right")}>
                      <RowActions
                        describedBy={`price-${item.id}`}
                        onEdit={() => {
                          setAlert(null);
                          setEditing({ mode: "edit", item });
                        }}
                        onDelete={() => {
                          setAlert(null);
                          setDeleting(item);
                        }}
                      />
                    </td>
                  ) : null}
                </tr>
              ))}
            </tbody>
          </table>
          <RowCapNote cap={cap} noun="items" />
        </div>
        <p className="text-sm tabular-nums text-ink-600">
          {filtered ? `${rows.length} of ${data.items.length} items` : `${data.items.length} ${data.items.length === 1 ? "item" : "items"}`} · prices in {data.currency}
        </p>
      </div>
    );
  }

  return (
    <div className="mt-6 space-y-4">
      {canWrite ? null : (
        <p className="text-sm text-ink-500">You can read the price list; Owners and Estimators keep it current.</p>
      )}
      {readOnlyAsk ? (
        <FormAlert message={`An estimate needs a price for ${readOnlyAsk}. Only an Owner or an Estimator can add it: ask one of them.`} />
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        {hasAny ? (
          <>
            <SearchInput
              label="Search the price list"
              placeholder="Search by SKU, description or size"
              value={search}
              maxLength={100}
              onSearch={(text) => update({ search: text }, { replace: true })}
              className="w-full sm:w-72"
            />
            <div className="w-full sm:w-52">
              <select
                aria-label="Category"
                value={category ?? ""}
                onChange={(event) => update({ category: event.target.value || null }, { replace: true })}
                className={controlClass}
              >
                <option value="">All categories</option>
                {PRICE_CATEGORIES.map((c) => (
                  <option key={c} value={c}>
                    {CATEGORY_LABELS[c]}
                  </option>
                ))}
              </select>
            </div>
          </>
        ) : null}
        <div className="ml-auto flex flex-wrap items-center gap-2">
          {hasAny ? (
            <a href={PRICE_LIST_EXPORT_HREF} download className={secondaryButtonClass}>
              Export CSV
            </a>
          ) : null}
          {canWrite && data ? <PriceListImport onNotice={setImportNotice} /> : null}
          {hasAny ? addButton : null}
        </div>
      </div>
      {importNotice?.kind === "refused" ? <RefusedRows refusal={importNotice.refusal} title="The CSV was not imported" /> : null}
      {importNotice?.kind === "done" ? <FormStatus message={importNotice.text} /> : null}
      <FormAlert message={alert} />
      {body}

      {editing && data ? (
        <Dialog
          size="lg"
          closeButton
          title={editing.mode === "new" ? "Add a price list item" : `Edit ${editing.item.sku}`}
          onClose={() => setEditing(null)}
        >
          <PriceItemForm
            item={editing.mode === "edit" ? editing.item : undefined}
            preset={editing.mode === "new" ? editing.preset : undefined}
            currency={data.currency}
            onSaved={() => setEditing(null)}
            onCancel={() => setEditing(null)}
          />
        </Dialog>
      ) : null}
      {deleting ? (
        <ConfirmDialog title={`Delete ${deleting.sku}?`} confirmLabel="Delete item" pending={remove.isPending} onConfirm={confirmDelete} onCancel={() => setDeleting(null)}>
          {deleting.description} leaves the price list. Estimates built from now on cannot use it. This cannot be undone.
        </ConfirmDialog>
      ) : null}
    </div>
  );
}
