import { useRef, useState } from "react";

/**
 * "Scan": opens the camera and hands the Code 128 it reads to `onCode`. Nothing of the scanner is
 * loaded before the button is pressed (camera-scanner.ts is import()ed then). Without a camera, or
 * when the browser refuses it, says so: the code can always be typed.
 */
export default function ScanButton({ onCode, label = "Scan" }: { onCode: (code: string) => void; label?: string }) {
  const video = useRef<HTMLVideoElement>(null);
  const stop = useRef<AbortController | null>(null);
  const [scanning, setScanning] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  async function start() {
    setProblem(null);
    setScanning(true);
    const controller = new AbortController();
    stop.current = controller;
    const scanner = await import("./camera-scanner");
    try {
      const code = await scanner.scanCode128(video.current!, controller.signal);
      if (code) onCode(code);
    } catch (error) {
      setProblem(scanner.cameraProblem(error));
    } finally {
      setScanning(false);
    }
  }

  return (
    <div className="flex w-full flex-col gap-2">
      <div>
        {scanning ? (
          <button type="button" className="btn btn-quiet" onClick={() => stop.current?.abort()}>
            Stop scanning
          </button>
        ) : (
          <button type="button" className="btn btn-quiet" onClick={start}>
            {label}
          </button>
        )}
      </div>
      <video
        ref={video}
        className={scanning ? "w-full max-w-sm rounded border border-[var(--color-rule)]" : "hidden"}
        muted
        playsInline
        aria-label="Camera view: hold the label's barcode inside the frame"
        data-testid="scan-video"
      />
      {problem && (
        <p className="notice" role="alert">
          {problem}
        </p>
      )}
    </div>
  );
}
