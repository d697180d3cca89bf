import { describe, expect, it } from "vitest";
import { Attachment } from "../../../server/db/entities/index.js";
import { JobLimits } from "../../../shared/schemas/jobs.js";
import { addMember, signUpCompany } from "../../support/accounts.js";
import { useTestApp } from "../../support/app.js";
import { JPEG_START, TINY_PDF, TINY_PNG } from "../../support/jobs.js";
import type { ApiClient } from "../../support/api.js";

async function jobFor(api: ApiClient) {
  const client = await api.post("/api/clients", { name: "Attachment client" });
  return (await api.post("/api/jobs", { clientId: client.body.id, title: "Photos" })).body.id as string;
}

describe("attachments: site photos and plans", () => {
  const t = useTestApp();

  it("uploads JPEG, PNG and PDF, lists them newest first, and serves the same bytes back", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const files = [
      { content: JPEG_START, name: "north wall.jpg", type: "image/jpeg" },
      { content: TINY_PNG, name: "panel.png", type: "image/png" },
      { content: TINY_PDF, name: "site plan.pdf", type: "application/pdf" },
    ];
    for (const file of files) {
      const r = await owner.api.upload(`/api/jobs/${jobId}/attachments`, file);
      expect(r.status, JSON.stringify(r.body)).toBe(201);
      expect(r.body).toMatchObject({ fileName: file.name, mediaType: file.type, sizeBytes: file.content.length, jobId });
      expect(r.body.uploadedBy.id).toBe(owner.userId);
    }
    const list = await owner.api.get(`/api/jobs/${jobId}/attachments`);
    expect(list.body.total).toBe(3);
    expect(list.body.items.map((a: { fileName: string }) => a.fileName)).toEqual(["site plan.pdf", "panel.png", "north wall.jpg"]);
    const bySize = await owner.api.get(`/api/jobs/${jobId}/attachments?sort=sizeBytes&pageSize=1`);
    expect(bySize.body.items).toHaveLength(1);
    const png = list.body.items[1];
    const inline = await owner.api.get(png.url);
    expect(inline.status).toBe(200);
    expect(inline.headers["content-type"]).toBe("image/png");
    expect(inline.headers["content-disposition"]).toMatch(/^inline; filename="?panel\.png"?$/);
    expect(Buffer.compare(inline.body as Buffer, TINY_PNG)).toBe(0);
    const download = await owner.api.get(`${png.url}?download=1`);
    expect(download.headers["content-disposition"]).toMatch(/^attachment; filename="?panel\.png"?$/);
    const job = await owner.api.get(`/api/jobs/${jobId}`);
    expect(job.body.attachments).toHaveLength(3);
  });

  it("judges the type by content: a text file named .jpg is 415, and so is a real file of another type", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const fake = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: "<script>alert(1)</script>", name: "photo.jpg", type: "image/jpeg" });
    expect(fake.status).toBe(415);
    expect(fake.body.error.code).toBe("unsupported_media_type");
    expect(fake.body.error.message).toMatch(/JPEG, PNG or PDF/);
    const gif = Buffer.from("474946383961010001000000002c00000000010001000002003b", "hex");
    const gifAnswer = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: gif, name: "anim.png", type: "image/png" });
    expect(gifAnswer.status).toBe(415);
    expect(gifAnswer.body.error.message).toMatch(/image\/gif/);
    // A PNG named .pdf is stored as what it is.
    const renamed = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "plan.pdf", type: "application/pdf" });
    expect(renamed.body.mediaType).toBe("image/png");
    expect(await t.db.getRepository(Attachment).countBy({ jobId })).toBe(1);
  });

  it("over 10 MB is 413 and nothing is stored; 10 MB exactly is accepted", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const pad = (n: number) => Buffer.concat([TINY_PDF, Buffer.alloc(n - TINY_PDF.length, 0x20)]);
    const tooBig = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: pad(JobLimits.attachmentMaxBytes + 1), name: "big.pdf", type: "application/pdf" });
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.code).toBe("payload_too_large");
    expect(tooBig.body.error.message).toMatch(/10 MB/);
    expect(await t.db.getRepository(Attachment).countBy({ jobId })).toBe(0);
    const exact = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: pad(JobLimits.attachmentMaxBytes), name: "exact.pdf", type: "application/pdf" });
    expect(exact.status).toBe(201);
    expect(exact.body.sizeBytes).toBe(10 * 1024 * 1024);
  });

  it("no file, an empty file, two files or a folder in the name: clear 4xx answers, names kept safe", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const none = await owner.api.upload(`/api/jobs/${jobId}/attachments`, null, { note: "x" });
    expect(none.status).toBe(400);
    expect(none.body.error.details.field).toBe("file");
    const empty = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: Buffer.alloc(0), name: "e.png" });
    expect(empty.status).toBe(400);
    const wrongField = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { field: "photo", content: TINY_PNG, name: "a.png" });
    expect(wrongField.status).toBe(400);
    const json = await owner.api.post(`/api/jobs/${jobId}/attachments`, { file: "x" });
    expect(json.status).toBe(400);
    const traversal = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "../../etc/passwd.png" });
    expect(traversal.status, JSON.stringify(traversal.body)).toBe(201);
    expect(traversal.body.fileName).toBe("passwd.png");
    const hidden = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "..hidden|x.png" });
    expect(hidden.body.fileName).toBe("hidden_x.png");
    const windows = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "C:\\Users\\x\\roof.png" });
    expect(windows.body.fileName).toBe("roof.png");
  });

  it("delete removes it; an installer may look but not upload or delete", async () => {
    const owner = await signUpCompany(t.app);
    const installer = await addMember(t.db, t.app, owner.companyId, "installer");
    const jobId = await jobFor(owner.api);
    const photo = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "p.png" });
    expect((await installer.api.get(photo.body.url)).status).toBe(200);
    expect((await installer.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "i.png" })).status).toBe(403);
    expect((await installer.api.delete(`/api/attachments/${photo.body.id}`)).status).toBe(403);
    expect((await owner.api.delete(`/api/attachments/${photo.body.id}`)).status).toBe(204);
    expect((await owner.api.get(photo.body.url)).status).toBe(404);
  });

  it("an upload without the CSRF header is refused before it is read", async () => {
    const owner = await signUpCompany(t.app);
    const jobId = await jobFor(owner.api);
    const r = await owner.api.upload(`/api/jobs/${jobId}/attachments`, { content: TINY_PNG, name: "p.png" }, {}, { csrf: false });
    expect(r.status).toBe(403);
    expect(await t.db.getRepository(Attachment).countBy({ jobId })).toBe(0);
  });
});
