// The engine's command line (run through server/scripts/engine.mjs):
//   solve <system.json> [--case NAME]      → the result contract as JSON on stdout
//   autosize <system.json> <costs.json>     → the auto-size proposal as JSON on stdout
// Exit 0 on success; exit 2 with { "ok": false, "errors": [...] } on stdout and a one-line
// message on stderr for bad input; exit 1 for a usage error.
import { readFileSync } from "node:fs";
import { autosize } from "../../shared/engine/autosize.js";
import { resolveLengths } from "../../shared/engine/lengths.js";
import { solveSystem } from "../../shared/engine/system.js";

interface CliError { code: string; message: string; path?: string }

function readJson(file: string, what: string): { ok: true; value: unknown } | { ok: false; error: CliError } {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    return { ok: false, error: { code: "CANNOT_READ", message: `${what} ${file}: ${code === "ENOENT" ? "no such file" : `cannot be read (${code})`}` } };
  }
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch (error) {
    return { ok: false, error: { code: "INVALID_JSON", message: `${what} ${file} is not valid JSON: ${(error as Error).message}` } };
  }
}

function usage(): number {
  process.stderr.write("usage: npm run --silent solve -- system.json [--case NAME]\n       npm run --silent autosize -- system.json costs.json\n");
  return 1;
}

function fail(errors: CliError[]): number {
  process.stdout.write(`${JSON.stringify({ ok: false, errors }, null, 2)}\n`);
  const first = errors[0];
  process.stderr.write(`runwright: ${first.message}${errors.length > 1 ? ` (and ${errors.length - 1} more error${errors.length > 2 ? "s" : ""})` : ""}\n`);
  return 2;
}

async function load(file: string): Promise<{ ok: true; value: unknown } | { ok: false; code: number }> {
  const doc = readJson(file, "system file");
  if (!doc.ok) return { ok: false, code: fail([doc.error]) };
  const resolved = await resolveLengths(doc.value);
  if (!resolved.ok) return { ok: false, code: fail(resolved.errors.map((e) => ({ code: "INVALID_FIELD", ...e }))) };
  return { ok: true, value: resolved.value };
}

export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  if (command === "solve") {
    const files: string[] = [];
    let caseName: string | undefined;
    for (let i = 0; i < rest.length; i++) {
      if (rest[i] === "--case") {
        caseName = rest[++i];
        if (caseName === undefined) return usage();
      } else if (rest[i].startsWith("--")) return usage();
      else files.push(rest[i]);
    }
    if (files.length !== 1) return usage();
    const doc = await load(files[0]);
    if (!doc.ok) return doc.code;
    const result = solveSystem(doc.value, { caseName });
    if (!result.ok) return fail(result.errors);
    process.stdout.write(`${JSON.stringify(result)}\n`);
    return 0;
  }
  if (command === "autosize") {
    if (rest.length !== 2 || rest.some((a) => a.startsWith("--"))) return usage();
    const doc = await load(rest[0]);
    if (!doc.ok) return doc.code;
    const costs = readJson(rest[1], "costs file");
    if (!costs.ok) return fail([costs.error]);
    const result = autosize(doc.value, costs.value);
    if (!result.ok) return fail(result.errors);
    process.stdout.write(`${JSON.stringify(result)}\n`);
    return 0;
  }
  return usage();
}
