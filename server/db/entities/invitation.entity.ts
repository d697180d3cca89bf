import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from "typeorm";
import type { Role } from "../../../shared/schemas/team.js";
import { Company } from "./company.entity.js";
import { User } from "./user.entity.js";

/** An e-mailed offer to join a company. The link's secret is kept only as a SHA-256 hash. */
@Entity({ name: "invitation" })
@Check("CHK_invitation_role", `"role" IN ('owner', 'estimator', 'installer')`)
@Index("IDX_invitation_company", ["companyId"])
// At most one live invitation per address and company: only the newest link works.
@Index("UQ_invitation_pending", ["companyId", "email"], { unique: true, where: `"accepted_at" IS NULL AND "revoked_at" IS NULL` })
export class Invitation {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "varchar", length: 254 })
  email!: string;

  @Column({ type: "varchar", length: 20 })
  role!: Role;

  @Column({ type: "char", length: 64, name: "token_hash" })
  tokenHash!: string;

  @Column({ type: "timestamptz", name: "expires_at" })
  expiresAt!: Date;

  @Column({ type: "timestamptz", name: "accepted_at", nullable: true })
  acceptedAt!: Date | null;

  @Column({ type: "timestamptz", name: "revoked_at", nullable: true })
  revokedAt!: Date | null;

  @Column({ type: "uuid", name: "invited_by_id", nullable: true })
  invitedById!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "invited_by_id" })
  invitedBy!: Relation<User> | null;
}
