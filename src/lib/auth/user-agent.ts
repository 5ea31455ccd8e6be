/**
 * "Firefox on Windows", "Chrome on Android": what a person recognises of a browser's User-Agent
 * header, for the lists of sessions and sign-ins. Order matters: Edge and Opera also say Chrome,
 * Chrome also says Safari.
 */
const BROWSERS: [RegExp, string][] = [
  [/Edg(e|A|iOS)?\//, "Edge"],
  [/OPR\/|Opera/, "Opera"],
  [/Firefox\/|FxiOS/, "Firefox"],
  [/HeadlessChrome/, "Headless Chromium"],
  [/Chromium\//, "Chromium"],
  [/Chrome\/|CriOS/, "Chrome"],
  [/Safari\//, "Safari"],
  [/curl\//, "curl"],
  [/node|undici/i, "a script (Node.js)"],
];
const SYSTEMS: [RegExp, string][] = [
  [/Android/, "Android"],
  [/iPhone|iPad|iPod/, "iOS"],
  [/Windows/, "Windows"],
  [/Mac OS X|Macintosh/, "macOS"],
  [/CrOS/, "ChromeOS"],
  [/Linux/, "Linux"],
];

export function describeBrowser(userAgent: string | null | undefined): string {
  if (!userAgent) return "Unknown browser";
  const browser = BROWSERS.find(([re]) => re.test(userAgent))?.[1] ?? "Unknown browser";
  const system = SYSTEMS.find(([re]) => re.test(userAgent))?.[1];
  return system ? `${browser} on ${system}` : browser;
}
