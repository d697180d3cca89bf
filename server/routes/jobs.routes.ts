import { Router, type RequestHandler } from "express";
import { AttachmentListQuery, CreateJobInput, CreateSystemInput, JobLimits, JobListQuery, UpdateJobInput } from "../../shared/schemas/jobs.js";
import { can, requireAuth } from "../auth/context.js";
import { singleFile } from "../middleware/upload.js";
import { presentAttachment, presentJobDetail, presentJobSummary, presentSystem } from "../presenters/jobs.presenter.js";
import { addAttachment, listAttachments } from "../services/attachment.service.js";
import { createJob, deleteJob, getJobDetail, listJobs, updateJob } from "../services/job.service.js";
import { createSystem, getSystem } from "../services/system.service.js";
import { companyScope, idParam } from "../services/tenancy.js";
import { Job } from "../db/entities/index.js";
import type { AccountDeps } from "./deps.js";

export function jobRoutes({ db }: AccountDeps): Router {
  const router = Router();

  router.get("/", can("jobs:read"), async (req, res) => {
    const page = await listJobs(db, requireAuth(req).companyId, JobListQuery.parse(req.query));
    res.json({ ...page, items: page.items.map(presentJobSummary) });
  });

  router.post("/", can("jobs:write"), async (req, res) => {
    const input = CreateJobInput.parse(req.body);
    const auth = requireAuth(req);
    const id = await createJob(db, auth.companyId, auth.userId, input);
    res.status(201).json(presentJobDetail(await getJobDetail(db, auth.companyId, id)));
  });

  router.get("/:jobId", can("jobs:read"), async (req, res) => {
    res.json(presentJobDetail(await getJobDetail(db, requireAuth(req).companyId, idParam(req.params.jobId, "Job"))));
  });

  router.patch("/:jobId", can("jobs:write"), async (req, res) => {
    const id = idParam(req.params.jobId, "Job");
    const patch = UpdateJobInput.parse(req.body);
    const { companyId } = requireAuth(req);
    await updateJob(db, companyId, id, patch);
    res.json(presentJobDetail(await getJobDetail(db, companyId, id)));
  });

  router.delete("/:jobId", can("jobs:write"), async (req, res) => {
    await deleteJob(db, requireAuth(req).companyId, idParam(req.params.jobId, "Job"));
    res.status(204).end();
  });

  router.post("/:jobId/systems", can("jobs:write"), async (req, res) => {
    const jobId = idParam(req.params.jobId, "Job");
    const input = CreateSystemInput.parse(req.body);
    const auth = requireAuth(req);
    const system = await createSystem(db, auth.companyId, auth.userId, jobId, input);
    res.status(201).json(presentSystem(await getSystem(db.manager, auth.companyId, system.id)));
  });

  router.get("/:jobId/attachments", can("jobs:read"), async (req, res) => {
    const jobId = idParam(req.params.jobId, "Job");
    const page = await listAttachments(db, requireAuth(req).companyId, jobId, AttachmentListQuery.parse(req.query));
    res.json({ ...page, items: page.items.map(presentAttachment) });
  });

  // The job is looked up before the upload is read: an unknown job is a 404 whatever was sent.
  const jobExists: RequestHandler = async (req, _res, next) => {
    await companyScope(db.manager, requireAuth(req).companyId).mustFind(Job, { id: idParam(req.params.jobId, "Job") }, "Job");
    next();
  };

  router.post("/:jobId/attachments", can("jobs:write"), jobExists, singleFile("file", JobLimits.attachmentMaxBytes, "file"), async (req, res) => {
    const jobId = idParam(req.params.jobId, "Job");
    const auth = requireAuth(req);
    res.status(201).json(presentAttachment(await addAttachment(db, auth.companyId, auth.userId, jobId, req.file)));
  });

  return router;
}
