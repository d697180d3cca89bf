import { Check, Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from "typeorm";
import { Company } from "./company.entity.js";
import { Job } from "./job.entity.js";
import { User } from "./user.entity.js";

/**
 * A site photo or plan on a job. The bytes live in PostgreSQL (bytea, at most 10 MB), so every app
 * instance sees the same files and a backup of the database holds them; lists never select them.
 */
@Entity({ name: "attachment" })
@Index("IDX_attachment_job", ["jobId", "createdAt"])
@Check("CHK_attachment_media_type", `"media_type" IN ('image/jpeg', 'image/png', 'application/pdf')`)
@Check("CHK_attachment_size", `"size_bytes" > 0 AND "size_bytes" <= 10485760`)
export class Attachment {
  @PrimaryGeneratedColumn("uuid")
  id!: string;

  @Column({ type: "uuid", name: "company_id" })
  companyId!: string;

  @Column({ type: "uuid", name: "job_id" })
  jobId!: string;

  @Column({ type: "varchar", length: 255, name: "file_name" })
  fileName!: string;

  /** From the content's signature, not from the name or the browser's claim. */
  @Column({ type: "varchar", length: 40, name: "media_type" })
  mediaType!: "image/jpeg" | "image/png" | "application/pdf";

  @Column({ type: "integer", name: "size_bytes" })
  sizeBytes!: number;

  @Column({ type: "bytea", select: false })
  content!: Buffer;

  @Column({ type: "uuid", name: "uploaded_by_id", nullable: true })
  uploadedById!: string | null;

  @CreateDateColumn({ type: "timestamptz", name: "created_at" })
  createdAt!: Date;

  @ManyToOne(() => Company, { onDelete: "CASCADE" })
  @JoinColumn({ name: "company_id" })
  company!: Relation<Company>;

  @ManyToOne(() => Job, { onDelete: "CASCADE" })
  @JoinColumn({ name: "job_id" })
  job!: Relation<Job>;

  @ManyToOne(() => User, { onDelete: "SET NULL" })
  @JoinColumn({ name: "uploaded_by_id" })
  uploadedBy!: Relation<User> | null;
}
