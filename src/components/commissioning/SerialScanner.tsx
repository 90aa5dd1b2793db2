import { useEffect, useRef, useState } from 'react';

/**
 * Reads the serial from the cylinder's barcode or QR code with the phone camera. The barcode
 * library is loaded only when the engineer asks to scan, so the wizard stays light.
 */
export function SerialScanner({ onSerial }: { onSerial: (serial: string) => void }) {
  const [open, setOpen] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const preview = useRef<HTMLVideoElement>(null);

  useEffect(() => {
    if (!open) return;
    let stop: (() => void) | undefined;
    let cancelled = false;
    (async () => {
      try {
        const { BrowserMultiFormatReader } = await import('@zxing/browser');
        if (cancelled || !preview.current) return;
        const reader = new BrowserMultiFormatReader();
        const controls = await reader.decodeFromConstraints({ video: { facingMode: 'environment' } }, preview.current, (result) => {
          if (result) { onSerial(result.getText().trim()); setOpen(false); }
        });
        stop = () => controls.stop();
        if (cancelled) stop();
      } catch (err) {
        setMessage(err instanceof Error && /Permission|NotAllowed/i.test(err.name + err.message)
          ? 'The camera was not allowed. Allow it in the browser’s site settings, or type the serial.'
          : 'No camera could be opened on this device. Type the serial from the data plate instead.');
        setOpen(false);
      }
    })();
    return () => { cancelled = true; stop?.(); };
  }, [open, onSerial]);

  return (
    <div>
      <button type="button" className="btn-quiet" onClick={() => { setMessage(null); setOpen((o) => !o); }}>{open ? 'Stop scanning' : 'Scan the code'}</button>
      {open && <video ref={preview} className="mt-2 w-full max-w-sm rounded-md border border-line" muted playsInline aria-label="Camera view for scanning the serial" />}
      {message && <p role="status" className="mt-1 text-sm text-ochre">{message}</p>}
    </div>
  );
}
