import { useCallback } from "react";
import { useSearchParams } from "react-router-dom";
import { JobLimits } from "../../../../shared/schemas/jobs";

type Change = string | number | null | undefined;

/**
 * A list's page, sort and search read from the address (?page=2&sort=-updatedAt&search=…),
 * so a filtered list can be linked, reloaded and gone back to. Defaults stay out of the address.
 */
export function useListParams({ sorts, defaultSort }: { sorts: readonly string[]; defaultSort: string }) {
  const [params, setParams] = useSearchParams();

  const rawPage = Number(params.get("page"));
  const page = Number.isInteger(rawPage) && rawPage >= 1 && rawPage <= 1_000_000 ? rawPage : 1;
  const rawSort = params.get("sort");
  const sort = rawSort && sorts.includes(rawSort) ? rawSort : defaultSort;
  const search = (params.get("search") ?? "").trim().slice(0, JobLimits.searchMax);

  /** Changes some parameters; any change but the page itself goes back to page 1. */
  const update = useCallback(
    (changes: Record<string, Change>, { replace = false }: { replace?: boolean } = {}) => {
      setParams(
        (previous) => {
          const next = new URLSearchParams(previous);
          for (const [name, value] of Object.entries(changes)) {
            if (value === null || value === undefined || value === "") next.delete(name);
            else next.set(name, String(value));
          }
          if (!("page" in changes)) next.delete("page");
          if (next.get("page") === "1") next.delete("page");
          if (next.get("sort") === defaultSort) next.delete("sort");
          return next;
        },
        { replace },
      );
    },
    [setParams, defaultSort],
  );

  return { params, page, sort, search, update };
}

/** Sort values a list accepts: each field ascending and, with "-", descending. */
export const sortValues = (fields: readonly string[]) => fields.flatMap((f) => [f, `-${f}`]);
