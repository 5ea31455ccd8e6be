// Loaded only when "Scan" is pressed (ScanButton import()s it): the camera stream and a Code 128
// reader, the browser's BarcodeDetector where it reads Code 128, else the barcode-detector
// polyfill, whose ZXing WebAssembly Vite emits as one of Decant's own files (no outside fetch).
import wasmUrl from "zxing-wasm/reader/zxing_reader.wasm?url";

interface Detector {
  detect(source: HTMLVideoElement): Promise<{ rawValue: string; format: string }[]>;
}

async function code128Detector(): Promise<Detector> {
  const native = (globalThis as { BarcodeDetector?: { getSupportedFormats(): Promise<string[]>; new (o: object): Detector } })
    .BarcodeDetector;
  if (native && (await native.getSupportedFormats()).includes("code_128")) return new native({ formats: ["code_128"] });
  const { BarcodeDetector, prepareZXingModule } = await import("barcode-detector/ponyfill");
  prepareZXingModule({ overrides: { locateFile: (path: string, prefix: string) => (path.endsWith(".wasm") ? wasmUrl : prefix + path) } });
  return new BarcodeDetector({ formats: ["code_128"] });
}

/** Why the camera could not be used, in words for the person holding the phone. */
export function cameraProblem(error: unknown): string {
  const name = error instanceof DOMException ? error.name : "";
  if (name === "NotAllowedError" || name === "SecurityError")
    return "The camera is not allowed for Decant in this browser. Type the code instead, or allow the camera in the browser's settings.";
  if (name === "NotFoundError" || name === "OverconstrainedError") return "No camera was found. Type the code instead.";
  return "The camera could not be started. Type the code instead.";
}

/** Shows the camera in `video` and resolves with the first Code 128 read, until `signal` aborts. */
export async function scanCode128(video: HTMLVideoElement, signal: AbortSignal): Promise<string | null> {
  if (!navigator.mediaDevices?.getUserMedia) throw new DOMException("no camera", "NotFoundError");
  const stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: "environment" }, audio: false });
  try {
    video.srcObject = stream;
    await video.play();
    const detector = await code128Detector();
    while (!signal.aborted) {
      const found = await detector.detect(video).catch(() => []);
      const code = found.find((b) => b.format === "code_128")?.rawValue;
      if (code) return code;
      await new Promise((resolve) => setTimeout(resolve, 150));
    }
    return null;
  } finally {
    for (const track of stream.getTracks()) track.stop();
    video.srcObject = null;
  }
}
