/**
 * The one way Decant stores uploaded files (certificates of analysis, imports). Files live under
 * UPLOAD_DIR, outside `public/`, so the web server never serves them directly: a route that has
 * checked the user's permission reads them back through `readUpload`. Swapping this module for
 * an object store is the only change needed to run several app instances without shared disk.
 */
import { randomBytes } from "node:crypto";
import { mkdir, readFile, rm, writeFile } from "node:fs/promises";
import { dirname, isAbsolute, join, resolve, sep } from "node:path";
import { getEnv } from "./env";
import { HttpError } from "./http";

export interface DetectedType {
  mime: "application/pdf" | "image/png" | "image/jpeg" | "image/webp";
  extension: "pdf" | "png" | "jpg" | "webp";
}

/** What a file is, from its first bytes; never from its name or the browser's claim. */
export function detectType(bytes: Uint8Array): DetectedType | null {
  const starts = (...sig: number[]) => sig.every((b, i) => bytes[i] === b);
  if (starts(0x25, 0x50, 0x44, 0x46, 0x2d)) return { mime: "application/pdf", extension: "pdf" }; // %PDF-
  if (starts(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a)) return { mime: "image/png", extension: "png" };
  if (starts(0xff, 0xd8, 0xff)) return { mime: "image/jpeg", extension: "jpg" };
  if (starts(0x52, 0x49, 0x46, 0x46) && bytes[8] === 0x57 && bytes[9] === 0x45 && bytes[10] === 0x42 && bytes[11] === 0x50)
    return { mime: "image/webp", extension: "webp" };
  return null;
}

export const CERTIFICATE_MAX_BYTES = 10 * 1024 * 1024;

export interface StoredFile {
  /** Storage key, e.g. "certificates/2026/3f…e1.pdf"; the only thing the database keeps. */
  key: string;
  mime: DetectedType["mime"];
  size: number;
}

function root(): string {
  const dir = getEnv().UPLOAD_DIR;
  return isAbsolute(dir) ? dir : resolve(process.cwd(), dir);
}

const KEY = /^[a-z]+\/\d{4}\/[0-9a-f]{32}\.(pdf|png|jpg|webp)$/;

function pathOf(key: string): string {
  if (!KEY.test(key)) throw new HttpError(404, "No such file.");
  const base = root();
  const full = join(base, key);
  if (!full.startsWith(base + sep)) throw new HttpError(404, "No such file.");
  return full;
}

/**
 * Checks and stores a certificate of analysis: a PDF or an image (PNG, JPEG, WebP) of at most
 * CERTIFICATE_MAX_BYTES. `field` names the form field in the 400 answer.
 */
export async function storeCertificate(bytes: Uint8Array, field = "certificate"): Promise<StoredFile> {
  if (bytes.byteLength === 0) throw new HttpError(400, `${field}: the file is empty`);
  if (bytes.byteLength > CERTIFICATE_MAX_BYTES)
    throw new HttpError(
      400,
      `${field}: the file is ${(bytes.byteLength / 1048576).toFixed(1)} MB; the limit is ${CERTIFICATE_MAX_BYTES / 1048576} MB`,
    );
  const type = detectType(bytes);
  if (!type)
    throw new HttpError(
      400,
      `${field}: only a PDF or an image (PNG, JPEG, WebP) is accepted; this file's content is neither, whatever its name says`,
    );
  const key = `certificates/${new Date().getUTCFullYear()}/${randomBytes(16).toString("hex")}.${type.extension}`;
  const full = pathOf(key);
  await mkdir(dirname(full), { recursive: true });
  await writeFile(full, bytes, { flag: "wx" });
  return { key, mime: type.mime, size: bytes.byteLength };
}

export async function readUpload(key: string): Promise<Buffer> {
  try {
    return await readFile(pathOf(key));
  } catch (error) {
    if (error instanceof HttpError) throw error;
    throw new HttpError(404, "The file is no longer in storage.");
  }
}

/** Removes a stored file; used when the record it belonged to was not written after all. */
export async function removeUpload(key: string): Promise<void> {
  await rm(pathOf(key), { force: true });
}
