import type { Estimate, SuppliedLoad } from "../../../../shared/schemas/estimates";
import { controlClass } from "../../../components/ui/form";
import { LoadFailed } from "../../../components/ui/load-failed";
import { cn } from "../../../utils/cn";
import { usePriceDevices } from "../api/get-price-devices";

interface SuppliedLoadsProps {
  loads: Estimate["loads"];
  supplied: SuppliedLoad[];
  canWrite: boolean;
  onChoose: (load: { systemId: string; loadId: string }, priceItemId: string | null) => void;
}

/** "Loads the contractor supplies": each load of the job's systems, priced from a device in the price list when we supply it. */
export function SuppliedLoads({ loads, supplied, canWrite, onChoose }: SuppliedLoadsProps) {
  const devices = usePriceDevices(loads.length > 0);
  const chosen = (systemId: string, loadId: string) => supplied.find((s) => s.systemId === systemId && s.loadId === loadId)?.priceItemId ?? "";
  const deviceName = (id: string) => devices.data?.find((d) => d.id === id)?.description;

  return (
    <section aria-labelledby="supplied-heading" className="space-y-2">
      <div>
        <h2 id="supplied-heading" className="text-base font-semibold text-ink-900">
          Loads the contractor supplies
        </h2>
        <p className="text-sm text-ink-500">Choose the device from your price list for each load you supply; the client's own equipment stays unpriced.</p>
      </div>
      {loads.length === 0 ? (
        <p className="rounded-lg border border-dashed border-ink-200 bg-white px-4 py-4 text-sm text-ink-500">The job's systems have no loads yet.</p>
      ) : (
        <>
          {devices.error ? (
            <LoadFailed message={`The price list could not be loaded. ${devices.error.message}`} retrying={devices.isFetching} onRetry={() => void devices.refetch()} />
          ) : null}
          {canWrite && devices.data && devices.data.length === 0 ? (
            <p className="text-sm text-ink-600">Your price list has no devices yet: add them under the Device or Other category to choose them here.</p>
          ) : null}
          <ul aria-label="Loads" className="divide-y divide-ink-100 rounded-lg border border-ink-100 bg-white text-sm">
            {loads.map((load) => {
              const value = chosen(load.systemId, load.loadId);
              const selectId = `supplied-${load.systemId}-${load.loadId}`;
              return (
                <li key={`${load.systemId}/${load.loadId}`} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                  <label htmlFor={selectId} className="min-w-0">
                    <span className="font-medium text-ink-900">{load.name}</span> <span className="text-ink-500">· {load.systemName}</span>
                  </label>
                  {canWrite ? (
                    <select
                      id={selectId}
                      value={value}
                      disabled={devices.isPending && loads.length > 0}
                      onChange={(event) => onChoose(load, event.target.value === "" ? null : event.target.value)}
                      className={cn(controlClass, "w-full py-1 sm:w-72")}
                    >
                      <option value="">{devices.isPending ? "Loading the price list…" : "Not supplied by us"}</option>
                      {devices.data?.map((d) => (
                        <option key={d.id} value={d.id}>
                          {d.description} ({d.sku})
                        </option>
                      ))}
                      {value && devices.data && !deviceName(value) ? <option value={value}>A device no longer in the price list</option> : null}
                    </select>
                  ) : (
                    <span id={selectId} className="text-ink-700">
                      {value ? (deviceName(value) ?? "A device from the price list") : <span className="text-ink-500">Not supplied by us</span>}
                    </span>
                  )}
                </li>
              );
            })}
          </ul>
        </>
      )}
    </section>
  );
}
