import type { Attachment as AttachmentView, Client as ClientView, JobDetail, JobSummary, LimitProfileRecord, SystemRecord, SystemSummary } from "../../shared/schemas/jobs.js";
import type { Attachment, System, User } from "../db/entities/index.js";
import type { ClientWithJobs } from "../services/client.service.js";
import type { JobRow } from "../services/job.service.js";
import type { LimitProfileWithUse } from "../services/limit-profile.service.js";

// Presenters name every field that leaves the server; nothing else does.

const person = (user: User | null | undefined) => (user ? { id: user.id, name: user.name } : null);

export function presentClient(c: ClientWithJobs): ClientView {
  return {
    id: c.id,
    name: c.name,
    email: c.email,
    phone: c.phone,
    billingAddress: c.billingAddress,
    notes: c.notes,
    jobCount: c.jobCount,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

export function presentJobSummary(row: JobRow): JobSummary {
  const { job } = row;
  return {
    id: job.id,
    title: job.title,
    status: job.status,
    siteAddress: job.siteAddress,
    client: { id: job.clientId, name: row.clientName },
    systemCount: row.systemCount,
    worstStatus: row.worstStatus,
    createdAt: job.createdAt.toISOString(),
    updatedAt: job.updatedAt.toISOString(),
  };
}

const countOf = (document: Record<string, unknown>, key: string) => (Array.isArray(document[key]) ? (document[key] as unknown[]).length : 0);

export function presentSystemSummary(s: System): SystemSummary {
  return {
    id: s.id,
    name: s.name,
    nominalVoltage: s.nominalVoltage,
    units: s.units,
    limitProfileId: s.limitProfileId,
    loadCount: countOf(s.document, "loads"),
    runCount: countOf(s.document, "runs"),
    lastSolve: s.lastSolve,
    version: s.version,
    updatedAt: s.updatedAt.toISOString(),
  };
}

export function presentAttachment(a: Attachment): AttachmentView {
  return {
    id: a.id,
    jobId: a.jobId,
    fileName: a.fileName,
    mediaType: a.mediaType,
    sizeBytes: a.sizeBytes,
    uploadedBy: person(a.uploadedBy),
    createdAt: a.createdAt.toISOString(),
    url: `/api/attachments/${a.id}/file`,
  };
}

export function presentJobDetail(detail: JobRow & { systems: System[]; attachments: Attachment[] }): JobDetail {
  return {
    ...presentJobSummary(detail),
    notes: detail.job.notes,
    createdBy: person(detail.job.createdBy),
    systems: detail.systems.map(presentSystemSummary),
    attachments: detail.attachments.map(presentAttachment),
  };
}

export function presentSystem(s: System): SystemRecord {
  return {
    id: s.id,
    jobId: s.jobId,
    name: s.name,
    nominalVoltage: s.nominalVoltage,
    units: s.units,
    limitProfileId: s.limitProfileId,
    document: s.document,
    version: s.version,
    updatedAt: s.updatedAt.toISOString(),
    updatedBy: person(s.updatedBy),
  };
}

export function presentLimitProfile(p: LimitProfileWithUse): LimitProfileRecord {
  return {
    id: p.id,
    name: p.name,
    branchPercent: p.branchPercent,
    totalPercent: p.totalPercent,
    criticalPercent: p.criticalPercent,
    nearFraction: p.nearFraction,
    notes: p.notes,
    builtIn: p.builtIn,
    systemCount: p.systemCount,
    updatedAt: p.updatedAt.toISOString(),
  };
}
