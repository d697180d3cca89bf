import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type Relation } from "typeorm";
import type { PriceCategory, PriceUnit } from "../../../shared/schemas/estimates.js";
import { Company } from "./company.entity.js";
import { numericAsNumber } from "./numeric.js";

/** One line of a company's price list. Money in the company currency's minor unit (cents). */
@Entity({ name: "price_item" })
// SKUs are unique per company whatever their case ("CU-16" and "cu-16" are one item).
@Index("UQ_price_item_company_sku", { synchronize: false })
@Index("IDX_price_item_company", ["companyId", "category"])
@Check("CHK_price_item_category", `"category" IN ('cable', 'fuse', 'termination', 'device', 'labour', 'other')`)
@Check("CHK_price_item_unit", `"unit" IN ('m', 'ft', 'each', 'hour')`)
@Check("CHK_price_item_money", `"unit_cost_minor" >= 0 AND ("sell_price_minor" IS NULL OR "sell_price_minor" >= 0)`)
export class PriceItem {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "varchar", length: 40 })
  sku!: string;

  @Column({ type: "varchar", length: 200 })
  description!: string;

  @Column({ type: "varchar", length: 20 })
  category!: PriceCategory;

  @Column({ type: "varchar", length: 10 })
  unit!: PriceUnit;

  @Column({ type: "bigint", name: "unit_cost_minor", transformer: numericAsNumber })
  unitCostMinor!: number;

  @Column({ type: "bigint", name: "sell_price_minor", nullable: true, transformer: numericAsNumber })
  sellPriceMinor!: number | null;

  /** Cable: the conductor size label ("16 mm2"); terminations: the size they fit. */
  @Column({ type: "varchar", length: 40, name: "cable_size", nullable: true })
  cableSize!: string | null;

  @Column({ type: "varchar", length: 10, name: "cable_material", nullable: true })
  cableMaterial!: "copper" | "aluminum" | null;

  @Column({ type: "smallint", nullable: true })
  conductors!: number | null;

  @Column({ type: "numeric", precision: 9, scale: 2, name: "rating_a", nullable: true, transformer: numericAsNumber })
  ratingA!: number | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;
}
