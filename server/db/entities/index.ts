import { Company } from "./company.entity.js";

/** Every entity, in one list for the DataSource. */
export const entities = [Company];
export { Company };
