// Test fixtures for commissioning: images made on the fly, CSV files of installs, PDF text.
import { randomUUID } from 'node:crypto';
import sharp from 'sharp';

/** A real JPEG photo, `w` × `h` pixels, with some texture so it does not compress to nothing. */
export async function jpegPhoto(w = 640, h = 480): Promise<Buffer> {
  const raw = Buffer.alloc(w * h * 3);
  for (let i = 0; i < raw.length; i += 3) {
    raw[i] = (i * 7) % 256;
    raw[i + 1] = (i * 13) % 256;
    raw[i + 2] = (i / 3) % 256;
  }
  return sharp(raw, { raw: { width: w, height: h, channels: 3 } })
    .jpeg({ quality: 90 })
    .toBuffer();
}

export async function pngImage(w = 3000, h = 2000): Promise<Buffer> {
  return sharp({ create: { width: w, height: h, channels: 3, background: { r: 30, g: 110, b: 108 } } })
    .png()
    .toBuffer();
}

/** A JPEG cut off after its first part: starts right, cannot be decoded. */
export async function truncatedJpeg(): Promise<Buffer> {
  const full = await jpegPhoto(640, 480);
  return full.subarray(0, Math.floor(full.length / 3));
}

/** Every text item of every page of a PDF, joined (pdfjs-dist's legacy build runs in Node). */
export async function pdfText(bytes: Uint8Array): Promise<string> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const fonts = new URL('../../node_modules/pdfjs-dist/standard_fonts/', import.meta.url).pathname;
  const doc = await pdfjs.getDocument({
    data: new Uint8Array(bytes),
    standardFontDataUrl: fonts,
    useSystemFonts: false,
    isEvalSupported: false,
  }).promise;
  const out: string[] = [];
  for (let p = 1; p <= doc.numPages; p++) {
    const content = await (await doc.getPage(p)).getTextContent();
    out.push(content.items.map((i) => ('str' in i ? i.str : '')).join(' '));
  }
  await doc.destroy();
  // Lines of one paragraph come as separate items: join them into plain, single-spaced text.
  return out.join('\n').replace(/[ \t]+/g, ' ');
}

export const installsHeader =
  'home_reference,address,town,postcode,occupants,householder_name,householder_email,serial,cylinder_model,volume_l,height_m,sensor_count,heat_source,heat_pump_output_w,immersion_w,declared_loss_w,target_c,commissioned_on';

/** A good CSV row with a fresh serial and reference (invented demo data). */
export function installRow(overrides: Partial<Record<string, string>> = {}): string {
  const tag = randomUUID().slice(0, 8).toUpperCase();
  const v: Record<string, string> = {
    home_reference: `IMP-${tag}`,
    address: '7 Example Lane',
    town: 'Cobbmere',
    postcode: 'WM9 2AB',
    occupants: '2',
    householder_name: 'Alex Example',
    householder_email: `alex-${tag.toLowerCase()}@example.com`,
    serial: `C180-IMP-${tag}`,
    cylinder_model: 'C180 cylinder',
    volume_l: '180',
    height_m: '1.45',
    sensor_count: '8',
    heat_source: 'hp_coil',
    heat_pump_output_w: '6000',
    immersion_w: '3000',
    declared_loss_w: '1.4',
    target_c: '60',
    commissioned_on: '2024-09-01',
    ...overrides,
  };
  return installsHeader
    .split(',')
    .map((c) => v[c] ?? '')
    .join(',');
}

// ---- driving the commissioning API over HTTP ----

export interface Api {
  base: string;
  cookie: string;
}

export async function call(
  api: Api,
  method: string,
  path: string,
  body?: unknown,
): Promise<{ status: number; body: any }> {
  const res = await fetch(`${api.base}${path}`, {
    method,
    headers: {
      origin: api.base,
      cookie: api.cookie,
      ...(body !== undefined ? { 'content-type': 'application/json' } : {}),
    },
    body: body !== undefined ? JSON.stringify(body) : undefined,
  });
  const text = await res.text();
  let parsed: unknown = text;
  try {
    parsed = JSON.parse(text);
  } catch {
    /* not JSON */
  }
  return { status: res.status, body: parsed };
}

/** Answers for every step of a new install (invented demo data, a fresh serial). */
export function sampleAnswers(tag = randomUUID().slice(0, 8).toUpperCase()) {
  return {
    home: {
      addressLine: `${Math.floor(Math.random() * 90) + 10} Tarn Walk`,
      town: 'Tarnfield',
      postcode: 'WM7 4RT',
      occupants: '3',
      contactName: 'Jo Example',
      contactEmail: `jo-${tag.toLowerCase()}@example.com`,
    },
    cylinder: {
      serial: `C210-IT-${tag}`,
      model: 'C210 cylinder',
      volumeL: '210',
      heightM: '1.6',
      sensorCount: '6',
      exchanger: 'plate_ports',
      immersionW: '3000',
      declaredLossW: '1.6',
    },
    heat_source: {
      heatSource: 'hp_plate',
      hpOutputW: '8000',
      ntcR25Ohm: '10000',
      ntcBetaK: '3977',
      callC: '6',
      satisfiedC: '47',
    },
    target: { targetC: '60', hysteresisK: '5' },
    controls: { externalControl: 'none' },
    safety: {
      expansion: true,
      reliefValve: true,
      discharge: true,
      reducingValve: true,
      isolation: true,
      competentPerson: true,
    },
    signoff: { householderEmail: `jo-${tag.toLowerCase()}@example.com` },
  };
}

/** A reading as a tank sends it over HTTP ingest (layers bottom to top, °C). */
export async function sendReading(base: string, token: string, layersC: number[]): Promise<Response> {
  return fetch(`${base}/api/ingest`, {
    method: 'POST',
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
    body: JSON.stringify({ ts: new Date().toISOString(), layersC, compressor: false }),
  });
}

/** Runs a whole commissioning through the API: every step, registration, first reading, sign-off. */
export async function commissionOverHttp(
  api: Api,
  answers = sampleAnswers(),
): Promise<{ id: string; tankId: string; token: string; signOff: { status: number; body: any } }> {
  const created = await call(api, 'POST', '/api/commissioning', {});
  if (created.status !== 201)
    throw new Error(`POST /api/commissioning answered ${created.status}: ${JSON.stringify(created.body)}`);
  const id = created.body.id as string;
  for (const step of ['home', 'cylinder', 'heat_source', 'target', 'controls'] as const) {
    const r = await call(api, 'PATCH', `/api/commissioning/${id}`, { step, values: answers[step] });
    if (r.status !== 200) throw new Error(`Saving ${step} answered ${r.status}: ${JSON.stringify(r.body)}`);
  }
  const reg = await call(api, 'POST', `/api/commissioning/${id}/registration`, {});
  if (reg.status !== 201) throw new Error(`Registration answered ${reg.status}: ${JSON.stringify(reg.body)}`);
  const ingest = await sendReading(api.base, reg.body.token, [15, 22, 35, 48, 55, 58]);
  if (ingest.status !== 202) throw new Error(`Ingest answered ${ingest.status}: ${await ingest.text()}`);
  for (const step of ['safety', 'signoff'] as const) {
    const r = await call(api, 'PATCH', `/api/commissioning/${id}`, { step, values: answers[step] });
    if (r.status !== 200) throw new Error(`Saving ${step} answered ${r.status}: ${JSON.stringify(r.body)}`);
  }
  const signOff = await call(api, 'POST', `/api/commissioning/${id}/sign-off`, {});
  return { id, tankId: reg.body.tankId, token: reg.body.token, signOff };
}
