import { describe, expect, it } from "vitest";
import { useTestApp } from "../../support/app.js";
import { signUpCompany } from "../../support/accounts.js";
import { ApiClient } from "../../support/api.js";
import { createJobWork } from "../../support/jobs.js";
import { mailsTo, waitForMail } from "../../support/mail.js";
import { createQuoteWork } from "../../support/quotes.js";

describe("from layout to accepted quote", () => {
  const t = useTestApp();

  it("prices the layout, sends the quote with its PDF, and the client accepts through the link", async () => {
    const owner = await signUpCompany(t.app);
    const work = await createJobWork(owner.api);
    const q = await createQuoteWork(owner.api, work.jobId, t.app.url);

    const detail = await owner.api.get(`/api/quotes/${q.quoteId}`);
    expect(detail.status).toBe(200);
    expect(detail.body.status).toBe("sent");
    expect(detail.body.label).toMatch(/^Q-\d{4}-0001 R1$/);
    expect(detail.body.sentTo).toBe(q.clientEmail);

    const mails = await mailsTo(q.clientEmail);
    expect(mails).toHaveLength(1);
    const full = await fetch(`http://127.0.0.1:${(await import("vitest")).inject("mailCatcher").webPort}/api/email/${mails[0].id}`).then((r) => r.json());
    expect(full.attachments.map((a: { contentType: string }) => a.contentType)).toEqual(["application/pdf"]);

    const client = new ApiClient(t.app.app);
    const view = await client.get(`/api/quote-links/${q.token}`);
    expect(view.status, JSON.stringify(view.body)).toBe(200);
    expect(view.body.state).toBe("open");
    expect(view.body.status).toBe("viewed");
    const pdf = await client.get(`/api/quote-links/${q.token}/pdf`);
    expect(pdf.status).toBe(200);
    expect(pdf.headers["content-type"]).toBe("application/pdf");

    const accepted = await client.post(`/api/quote-links/${q.token}/accept`, { name: "Tamsin Fairweather", agree: true });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    expect(accepted.body.state).toBe("accepted");
    await waitForMail(owner.email);

    const again = await client.post(`/api/quote-links/${q.token}/accept`, { name: "Tamsin Fairweather", agree: true });
    expect(again.status).toBe(409);
    const job = await owner.api.get(`/api/jobs/${work.jobId}`);
    expect(job.body.status).toBe("won");
    const cut = await owner.api.get(`/api/jobs/${work.jobId}/cut-list.pdf`);
    expect(cut.status).toBe(200);
    const dash = await owner.api.get("/api/dashboard");
    expect(dash.status).toBe(200);
    expect(dash.body.byStatus.find((s: { status: string }) => s.status === "accepted").count).toBe(1);
    expect(dash.body.activity.map((a: { type: string }) => a.type)).toEqual(expect.arrayContaining(["sent", "viewed", "accepted"]));
  });
});
