import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, inject, it } from "vitest";

// The built app must not reach for any host but its own: no CDN scripts, no
// web fonts from elsewhere, no analytics.
const clientDir = inject("clientDir");

function filesUnder(dir: string): string[] {
  return readdirSync(dir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => path.join(entry.parentPath, entry.name));
}

// An SVG's xmlns is a name, not a request; nothing else with a scheme is allowed.
const XML_NAMESPACE = /xmlns(:\w+)?=(["']|%22|%27)?https?:\/\/www\.w3\.org\//g;

function externalUrls(text: string): string[] {
  return text.replace(XML_NAMESPACE, "").match(/https?:\/\/[^\s"'()<>]+/g) ?? [];
}

describe("the built client", () => {
  const files = filesUnder(clientDir);

  it("has an index.html, scripts, a stylesheet and the self-hosted fonts", () => {
    expect(files.some((f) => f.endsWith("index.html"))).toBe(true);
    expect(files.some((f) => f.endsWith(".js"))).toBe(true);
    expect(files.some((f) => f.endsWith(".css"))).toBe(true);
    expect(files.some((f) => /inter-latin-400-normal.*\.woff2$/.test(f))).toBe(true);
  });

  it("names no http(s) URL of another host in index.html or the CSS", () => {
    const checked = files.filter((f) => f.endsWith(".html") || f.endsWith(".css"));
    expect(checked.length).toBeGreaterThanOrEqual(2);
    for (const file of checked) {
      expect({ file, urls: externalUrls(readFileSync(file, "utf8")) }).toEqual({ file, urls: [] });
    }
  });

  it("would catch one if it were there", () => {
    expect(externalUrls('<link href="https://fonts.example.net/css?family=X">')).toEqual(["https://fonts.example.net/css?family=X"]);
    expect(externalUrls("@import url(http://cdn.example.org/a.css);")).toEqual(["http://cdn.example.org/a.css"]);
    expect(externalUrls('<svg xmlns="http://www.w3.org/2000/svg">')).toEqual([]);
  });

  it("loads its scripts and styles from its own origin only", () => {
    const html = readFileSync(path.join(clientDir, "index.html"), "utf8");
    const refs = [...html.matchAll(/(?:src|href)="([^"]+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(0);
    for (const ref of refs) expect(ref).toMatch(/^(\/|data:)/);
  });
});
