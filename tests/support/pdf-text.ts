import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** The text of a PDF as Debian's pdftotext reads it (`-layout` keeps columns apart); the temporary file is removed. */
export function pdfText(bytes: Uint8Array, options: { layout?: boolean } = {}): string {
  const dir = mkdtempSync(join(tmpdir(), "decant-pdf-"));
  try {
    const file = join(dir, "document.pdf");
    writeFileSync(file, bytes);
    return execFileSync("pdftotext", [...(options.layout === false ? [] : ["-layout"]), file, "-"], { encoding: "utf8" });
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
