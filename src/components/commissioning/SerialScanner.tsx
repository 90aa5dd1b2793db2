import { useEffect, useRef, useState } from 'react';

/**
 * Reads the serial from the cylinder's barcode or QR code with the phone camera. The barcode
 * library is loaded only when the engineer asks to scan, so the wizard stays light; it also makes
 * the camera preview element and opens the rear camera (no device chosen), and the preview is
 * placed in `frame` here.
 */
export function SerialScanner({ onSerial }: { onSerial: (serial: string) => void }) {
  const [open, setOpen] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const frame = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!open) return;
    let stop: (() => void) | undefined;
    let cancelled = false;
    (async () => {
      try {
        const { BrowserCodeReader, BrowserMultiFormatReader } = await import('@zxing/browser');
        if (cancelled || !frame.current) return;
        const camera = BrowserCodeReader.createVideoElement();
        camera.removeAttribute('width');
        camera.removeAttribute('height');
        camera.className = 'w-full rounded-md border border-line';
        camera.muted = true;
        camera.playsInline = true;
        camera.setAttribute('aria-label', 'Camera view for scanning the serial');
        frame.current.replaceChildren(camera);
        const controls = await new BrowserMultiFormatReader().decodeFromVideoDevice(undefined, camera, (result) => {
          if (result) {
            onSerial(result.getText().trim());
            setOpen(false);
          }
        });
        stop = () => {
          controls.stop();
          camera.remove();
        };
        if (cancelled) stop();
      } catch (err) {
        setMessage(
          err instanceof Error && /Permission|NotAllowed/i.test(err.name + err.message)
            ? 'The camera was not allowed. Allow it in the browser’s site settings, or type the serial.'
            : 'No camera could be opened on this device. Type the serial from the data plate instead.',
        );
        setOpen(false);
      }
    })();
    return () => {
      cancelled = true;
      stop?.();
    };
  }, [open, onSerial]);

  return (
    <div>
      <button
        type="button"
        className="btn-quiet"
        onClick={() => {
          setMessage(null);
          setOpen((o) => !o);
        }}
      >
        {open ? 'Stop scanning' : 'Scan the code'}
      </button>
      {open && <div ref={frame} className="mt-2 w-full max-w-sm" />}
      {message && (
        <p role="status" className="mt-1 text-sm text-ochre">
          {message}
        </p>
      )}
    </div>
  );
}
