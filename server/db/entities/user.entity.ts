import { Check, Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from "typeorm";

/** A person who signs in. E-mails are stored lower-cased, so the unique constraint is case-insensitive. */
@Entity({ name: "app_user" })
@Check("CHK_app_user_email_lower", `"email" = lower("email")`)
export class User {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "varchar", length: 254, unique: true })
  email!: string;

  @Column({ type: "varchar", length: 120 })
  name!: string;

  /** argon2id PHC string; never leaves the server (presenters whitelist fields). */
  @Column({ type: "varchar", length: 255, name: "password_hash" })
  passwordHash!: string;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @UpdateDateColumn({ type: "timestamptz", name: "updated_at" })
  updatedAt!: Date;

  @Column({ type: "timestamptz", name: "last_sign_in_at", nullable: true })
  lastSignInAt!: Date | null;
}
