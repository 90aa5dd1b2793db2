// Small generated photos for the demo's commissioning records: a cylinder's data plate with its
// invented serial, and a drawing of a finished installation. Drawn as SVG and encoded as JPEG by
// sharp, as an upload is stored (no real photographs).
import sharp from 'sharp';
import type { DemoTank } from './scenario';

export interface DemoPhoto {
  filename: string;
  body: Buffer;
  width: number;
  height: number;
}

/** Drawn on a 480 × 320 canvas, stored at 360 × 240: plenty on a record page, and quick to make. */
const W = 360;
const H = 240;
const svgOpen = `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 480 320">`;
const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

async function jpeg(svg: string): Promise<Buffer> {
  return sharp(Buffer.from(svg)).jpeg({ quality: 72 }).toBuffer();
}

/** The data plate on the cylinder's casing: model, serial, capacity, heat source. */
export async function dataPlatePhoto(t: DemoTank): Promise<DemoPhoto> {
  const lines = [
    t.model,
    `Serial ${t.serial}`,
    `${t.volumeL} L · ${t.sensorCount} sensors`,
    `Immersion ${t.immersionW / 1000} kW`,
    'Demo data plate',
  ];
  const svg = `${svgOpen}
    <rect width="480" height="320" fill="#b9bfb5"/>
    <rect x="70" y="48" width="340" height="224" rx="10" fill="#e9ebe6" stroke="#5c6660" stroke-width="3"/>
    ${lines.map((l, i) => `<text x="92" y="${96 + i * 38}" font-family="DejaVu Sans, sans-serif" font-size="${i === 1 ? 24 : 19}" font-weight="${i === 1 ? 'bold' : 'normal'}" fill="#1d2a2f">${esc(l)}</text>`).join('')}
  </svg>`;
  return { filename: `data-plate-${t.serial}.jpg`, body: await jpeg(svg), width: W, height: H };
}

const installationVariants = [
  { wall: '#d8cfbf', tank: '#f2f2ee', pipe: '#b87333' },
  { wall: '#c3cdd2', tank: '#ececea', pipe: '#a96a2d' },
  { wall: '#d9d4c7', tank: '#e4e7e3', pipe: '#c07d3c' },
];
const installationCache = new Map<number, Promise<Buffer>>();

/** The finished installation: the cylinder on its wall with flow, return and discharge pipework (a few variants, drawn once). */
export async function installationPhoto(variant: number): Promise<DemoPhoto> {
  const k = variant % installationVariants.length;
  let body = installationCache.get(k);
  if (!body) {
    const v = installationVariants[k]!;
    body = jpeg(`${svgOpen}
      <rect width="480" height="320" fill="${v.wall}"/>
      <rect x="0" y="272" width="480" height="48" fill="#8b7d6b"/>
      <rect x="170" y="36" width="140" height="236" rx="48" fill="${v.tank}" stroke="#7c8580" stroke-width="3"/>
      <rect x="214" y="150" width="52" height="30" rx="4" fill="#3d6f6b"/>
      <path d="M170 90 H96 V20 M170 230 H120 V20 M310 120 H380 V300 M310 200 H350 V300" stroke="${v.pipe}" stroke-width="9" fill="none"/>
      <circle cx="380" cy="120" r="11" fill="#c8a13a"/>
    </svg>`);
    installationCache.set(k, body);
  }
  return { filename: 'installation.jpg', body: await body, width: W, height: H };
}
