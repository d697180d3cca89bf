import type { ObjectLiteral, SelectQueryBuilder } from "typeorm";

export interface ListQuery {
  page: number;
  pageSize: number;
  sort: string;
  search?: string;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

/** `%`, `_` and `\` typed in a search box are matched literally. */
export function likePattern(search: string): string {
  return `%${search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/**
 * Applies `sort` ("name" or "-name", already checked against the allowed fields by the schema),
 * a tie-breaker on the id so pages never overlap, and the page window. Only for queries whose joins
 * are many-to-one (LIMIT counts rows). Text columns sort by lower() so "alpha" comes before "Bravo".
 */
export function pageAndSort<T extends ObjectLiteral>(qb: SelectQueryBuilder<T>, query: ListQuery, columns: Record<string, string>, idColumn: string) {
  const descending = query.sort.startsWith("-");
  const column = columns[descending ? query.sort.slice(1) : query.sort];
  if (!column) throw new Error(`no column for sort ${query.sort}`);
  return qb
    .orderBy(column, descending ? "DESC" : "ASC")
    .addOrderBy(idColumn, "ASC")
    .offset((query.page - 1) * query.pageSize)
    .limit(query.pageSize);
}
