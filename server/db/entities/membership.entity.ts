import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import type { Role } from "../../../shared/schemas/team.js";
import { Company } from "./company.entity.js";
import { User } from "./user.entity.js";

/** A user's place in a company, with their role. */
@Entity({ name: "membership" })
@Index("IDX_membership_user", ["userId"])
@Check("CHK_membership_role", `"role" IN ('owner', 'estimator', 'installer')`)
export class Membership {
  @PrimaryColumn({ type: "uuid", name: "company_id" })
  companyId!: string;

  @PrimaryColumn({ type: "uuid", name: "user_id" })
  userId!: string;

  @Column({ type: "varchar", length: 20 })
  role!: Role;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "user_id" })
  user!: Relation<User>;
}
