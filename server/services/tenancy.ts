import type { EntityManager, EntityTarget, FindManyOptions, FindOptionsWhere, ObjectLiteral } from "typeorm";
import { AppError } from "../errors.js";

type CompanyOwned = ObjectLiteral & { companyId: string };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** True for a well-formed uuid; ids that are not answer 404 like any other unknown id. */
export function isUuid(value: unknown): value is string {
  return typeof value === "string" && UUID.test(value);
}

/**
 * The one way services read and change company-owned rows: every query gets
 * `company_id = <the session's company>` added here, never an id from the
 * request body. A row of another company is indistinguishable from a missing
 * one (both 404).
 */
export function companyScope(manager: EntityManager, companyId: string) {
  const withCompany = <T extends CompanyOwned>(where: FindOptionsWhere<T> = {}) => ({ ...where, companyId }) as FindOptionsWhere<T>;
  return {
    companyId,
    find<T extends CompanyOwned>(entity: EntityTarget<T>, options: Omit<FindManyOptions<T>, "where"> & { where?: FindOptionsWhere<T> } = {}) {
      return manager.find(entity, { ...options, where: withCompany(options.where) });
    },
    count<T extends CompanyOwned>(entity: EntityTarget<T>, where?: FindOptionsWhere<T>) {
      return manager.count(entity, { where: withCompany(where) });
    },
    findOne<T extends CompanyOwned>(entity: EntityTarget<T>, where: FindOptionsWhere<T>) {
      return manager.findOne(entity, { where: withCompany(where) });
    },
    /** The row, or 404 naming what was not found. `lock` takes a row lock for the rest of the transaction. */
    async mustFind<T extends CompanyOwned>(entity: EntityTarget<T>, where: FindOptionsWhere<T>, noun: string, lock = false): Promise<T> {
      for (const value of Object.values(where)) {
        if (typeof value === "string" && value.length === 0) throw new AppError("not_found", `${noun} not found`);
      }
      const row = await manager.findOne(entity, { where: withCompany(where), ...(lock ? { lock: { mode: "pessimistic_write" as const } } : {}) });
      if (!row) throw new AppError("not_found", `${noun} not found`);
      return row;
    },
    update<T extends CompanyOwned>(entity: EntityTarget<T>, where: FindOptionsWhere<T>, patch: Partial<T>) {
      return manager.update(entity, withCompany(where), patch as never);
    },
    delete<T extends CompanyOwned>(entity: EntityTarget<T>, where: FindOptionsWhere<T>) {
      return manager.delete(entity, withCompany(where));
    },
  };
}
export type CompanyScope = ReturnType<typeof companyScope>;

/** A route parameter that names a row: anything but a uuid is simply not found. */
export function idParam(value: unknown, noun: string): string {
  if (!isUuid(value)) throw new AppError("not_found", `${noun} not found`);
  return value.toLowerCase();
}
