import { useEffect, useRef, useState } from "react";
import { useNavigate } from "react-router-dom";
import { PageHeader, Card } from "../../../components/ui/layout";
import { TextField } from "../../../components/ui/field";
import { Button } from "../../../components/ui/button";

/** The tag from a scanned code: our labels carry the status URL (…/t/TAG); a bare tag works too. */
export function tagFromCode(text: string): string {
  const m = /\/t\/([^/?#]+)/.exec(text);
  return decodeURIComponent(m ? m[1] : text).trim();
}

/** Camera scanner (QR codes of labels, or barcodes) that opens the tool's status page; typed entry as fallback. */
export function ScanPage() {
  const navigate = useNavigate();
  const video = useRef<HTMLVideoElement>(null);
  const [typed, setTyped] = useState("");
  const [camera, setCamera] = useState<"off" | "starting" | "on" | "failed">("off");
  const [problem, setProblem] = useState<string | null>(null);

  useEffect(() => {
    if (camera !== "starting") return;
    let stop: (() => void) | undefined;
    let cancelled = false;
    (async () => {
      try {
        const { BrowserMultiFormatReader } = await import("@zxing/browser");
        const reader = new BrowserMultiFormatReader();
        const controls = await reader.decodeFromVideoDevice(undefined, video.current!, (result) => {
          if (result && !cancelled) {
            cancelled = true;
            controls.stop();
            navigate(`/t/${encodeURIComponent(tagFromCode(result.getText()))}`);
          }
        });
        stop = () => controls.stop();
        if (cancelled) stop();
        else setCamera("on");
      } catch (e) {
        setCamera("failed");
        setProblem(e instanceof Error && e.name === "NotAllowedError" ? "The camera was not allowed. Allow it in the browser, or type the tag below." : "No camera could be opened here. Type the tag below.");
      }
    })();
    return () => {
      cancelled = true;
      stop?.();
    };
  }, [camera, navigate]);

  return (
    <div className="mx-auto max-w-xl">
      <PageHeader title="Scan a tool" subtitle="Point the camera at the tool's label to see whether it may be used." />
      <Card>
        <div className="overflow-hidden rounded-md bg-ink">
          <video ref={video} className={camera === "on" ? "aspect-[4/3] w-full object-cover" : "hidden"} muted playsInline aria-label="Camera view" />
        </div>
        {camera !== "on" && (
          <Button onClick={() => (setProblem(null), setCamera("starting"))} disabled={camera === "starting"} className="w-full text-lg">
            {camera === "starting" ? "Opening the camera…" : "Start camera"}
          </Button>
        )}
        {camera === "on" && (
          <Button variant="secondary" className="mt-2 w-full" onClick={() => setCamera("off")}>
            Stop camera
          </Button>
        )}
        {problem && (
          <p role="alert" className="mt-2 text-stop">
            {problem}
          </p>
        )}
      </Card>
      <Card className="mt-4" title="Or type the tag">
        <form
          onSubmit={(e) => {
            e.preventDefault();
            if (typed.trim()) navigate(`/t/${encodeURIComponent(tagFromCode(typed))}`);
          }}
          className="flex items-end gap-2"
        >
          <TextField label="Asset tag" value={typed} onChange={(e) => setTyped(e.target.value)} wrapperClassName="flex-1" className="font-mono" autoCapitalize="characters" />
          <Button type="submit">Check</Button>
        </form>
      </Card>
    </div>
  );
}
