import { useEffect, useRef, useState } from 'react';
import { Button } from '@/components/ui/button';

// The Barcode Detection API is not in TypeScript's DOM library yet.
interface DetectedBarcode {
  rawValue: string;
}
interface BarcodeDetectorLike {
  detect(source: HTMLVideoElement): Promise<DetectedBarcode[]>;
}
type BarcodeDetectorCtor = new (options?: { formats?: string[] }) => BarcodeDetectorLike;

function detectorClass(): BarcodeDetectorCtor | null {
  if (typeof window === 'undefined') return null;
  const ctor = (window as unknown as { BarcodeDetector?: BarcodeDetectorCtor }).BarcodeDetector;
  return ctor && typeof navigator.mediaDevices?.getUserMedia === 'function' ? ctor : null;
}

/** Whether this browser can read barcodes from the camera; elsewhere people type the serial. */
export function canScanBarcodes(): boolean {
  return detectorClass() !== null;
}

interface BarcodeScannerProps {
  onDetected: (value: string) => void;
  label?: string;
}

/**
 * A "Scan" button that opens the back camera and reads the first barcode or QR code it sees (a serial
 * label, a school's asset tag, or one of our QR labels). Shown only where the browser has a reader.
 */
export function BarcodeScanner({ onDetected, label = 'Scan a label' }: BarcodeScannerProps) {
  const [open, setOpen] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const videoRef = useRef<HTMLVideoElement>(null);

  useEffect(() => {
    if (!open) return;
    const Detector = detectorClass();
    if (!Detector) return;
    let stream: MediaStream | null = null;
    let timer: ReturnType<typeof setInterval> | undefined;
    let stopped = false;
    const detector = new Detector();
    void (async () => {
      try {
        stream = await navigator.mediaDevices.getUserMedia({ video: { facingMode: 'environment' }, audio: false });
        if (stopped || !videoRef.current) return;
        videoRef.current.srcObject = stream;
        await videoRef.current.play();
        timer = setInterval(async () => {
          if (!videoRef.current || videoRef.current.readyState < 2) return;
          try {
            const codes = await detector.detect(videoRef.current);
            const value = codes.find((c) => c.rawValue.trim())?.rawValue.trim();
            if (value && !stopped) {
              stopped = true;
              setOpen(false);
              onDetected(value);
            }
          } catch {
            // a frame the reader could not use; the next one may do
          }
        }, 250);
      } catch {
        setProblem('The camera could not be opened. Allow camera access, or type the serial number instead.');
        setOpen(false);
      }
    })();
    return () => {
      stopped = true;
      if (timer) clearInterval(timer);
      stream?.getTracks().forEach((track) => track.stop());
    };
  }, [open, onDetected]);

  if (!canScanBarcodes()) return null;
  return (
    <div className="flex flex-col gap-2">
      <Button variant="secondary" onClick={() => { setProblem(null); setOpen((o) => !o); }} aria-expanded={open}>
        {open ? 'Stop scanning' : label}
      </Button>
      {open ? (
        <div className="overflow-hidden rounded-xl border border-paper-300 bg-ink-950">
          <video ref={videoRef} className="aspect-video w-full object-cover" muted playsInline aria-label="Camera view for scanning" />
          <p className="bg-white px-3 py-2 text-sm text-ink-600">Hold the label steady inside the frame.</p>
        </div>
      ) : null}
      {problem ? <p role="alert" className="text-sm text-danger-700">{problem}</p> : null}
    </div>
  );
}

/** Our own QR labels carry the instrument page's address; a scan of one names the instrument directly. */
export function instrumentIdFromScan(value: string): string | null {
  const match = /\/registry\/instruments\/([0-9a-f-]{36})(?:[/?#]|$)/i.exec(value);
  return match ? match[1] : null;
}
