import { readFileSync } from "node:fs";
import { expect } from "vitest";
import type { SystemInput } from "../../shared/engine/schema.js";
import type { ApiClient } from "./api.js";

/** A network file from shared/engine/examples (invented jobs). */
export function exampleSystem(name: "cabin-24v" | "garden-12v" | "telecom-48v"): SystemInput {
  return JSON.parse(readFileSync(new URL(`../../shared/engine/examples/${name}.json`, import.meta.url), "utf8")) as SystemInput;
}

/** The smallest valid PNG (1 × 1 pixel), written out byte by byte. */
export const TINY_PNG = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8cfc0f01f0005000201b5c8d2d90000000049454e44ae426082",
  "hex",
);
/** A JPEG's first bytes (SOI + JFIF APP0): enough for a signature check. */
export const JPEG_START = Buffer.concat([Buffer.from("ffd8ffe000104a46494600010100000100010000", "hex"), Buffer.alloc(64, 0), Buffer.from("ffd9", "hex")]);
/** A one-page PDF with no content. */
export const TINY_PDF = Buffer.from(
  "%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 200 200]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n",
);

export interface JobWork {
  clientId: string;
  /** A client with no jobs (deletable). */
  spareClientId: string;
  jobId: string;
  systemId: string;
  /** The company's own (editable, unused) limit profile. */
  profileId: string;
  attachmentId: string;
}

/** A client with a job, a solved cabin system, an unused custom limit profile and a photo, made through the API. */
export async function createJobWork(api: ApiClient): Promise<JobWork> {
  const client = await api.post("/api/clients", { name: "Tamsin Fairweather (test client)", email: "tamsin@client.test" });
  expect(client.status, JSON.stringify(client.body)).toBe(201);
  const spare = await api.post("/api/clients", { name: "Spare Client" });
  expect(spare.status).toBe(201);
  const job = await api.post("/api/jobs", { clientId: client.body.id, title: "Test cabin", siteAddress: "Lot 3 (test)" });
  expect(job.status, JSON.stringify(job.body)).toBe(201);
  const system = await api.post(`/api/jobs/${job.body.id}/systems`, { name: "Cabin system", document: exampleSystem("cabin-24v") });
  expect(system.status, JSON.stringify(system.body)).toBe(201);
  const profile = await api.post("/api/limit-profiles", { name: `Spec ${Math.random().toString(36).slice(2, 8)}`, branchPercent: 2, totalPercent: 4, criticalPercent: 2 });
  expect(profile.status, JSON.stringify(profile.body)).toBe(201);
  const photo = await api.upload(`/api/jobs/${job.body.id}/attachments`, { content: TINY_PNG, name: "site.png", type: "image/png" });
  expect(photo.status, JSON.stringify(photo.body)).toBe(201);
  return { clientId: client.body.id, spareClientId: spare.body.id, jobId: job.body.id, systemId: system.body.id, profileId: profile.body.id, attachmentId: photo.body.id };
}
