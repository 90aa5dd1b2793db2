import type { HeatSource } from '../../db/schema/homes';
import { pick, seededRandom } from './random';

/**
 * The invented demo scenario: two service companies, their homes and one cylinder per home.
 * Pure and deterministic: the seed script stores it, the simulator plays it, and both agree
 * on every serial and specification without the simulator reading the database.
 */

export const faultKinds = [
  'sensor_open', 'sensor_stuck', 'sensors_swapped', 'short_cycle',
  'network_outage', 'low_setpoint', 'immersion_stuck',
] as const;
export type FaultKind = (typeof faultKinds)[number];

export interface CylinderModel { model: string; volumeL: number; heightM: number; sensorCount: number; declaredLossW: number }

/** Generic, invented cylinder models. Declared losses sit in the range typical of class B/C tanks (demo values). */
export const cylinderModels: readonly CylinderModel[] = [
  { model: 'C150 cylinder', volumeL: 150, heightM: 1.05, sensorCount: 8, declaredLossW: 48 },
  { model: 'C180 cylinder', volumeL: 180, heightM: 1.2, sensorCount: 10, declaredLossW: 52 },
  { model: 'C210 cylinder', volumeL: 210, heightM: 1.4, sensorCount: 12, declaredLossW: 57 },
  { model: 'C250 cylinder', volumeL: 250, heightM: 1.6, sensorCount: 14, declaredLossW: 63 },
  { model: 'C300 cylinder', volumeL: 300, heightM: 1.85, sensorCount: 16, declaredLossW: 70 },
];

export interface DemoCompany { slug: string; name: string; emailDomain: string; towns: readonly string[]; homeCount: number; refPrefix: string; serialPrefix: string }

export const demoCompanies: readonly DemoCompany[] = [
  { slug: 'kestrel-vale', name: 'Kestrel Vale Heating Co-operative', emailDomain: 'kestrelvale.example.com',
    towns: ['Ashby Wend', 'Larkholt', 'Cobbmere', 'Tarnfield'], homeCount: 240, refPrefix: 'KV', serialPrefix: 'KV' },
  { slug: 'orrin-bay', name: 'Orrin Bay Energy Services', emailDomain: 'orrinbay.example.com',
    towns: ['Orrin Quay', 'Saltmere'], homeCount: 24, refPrefix: 'OB', serialPrefix: 'OB' },
];

export interface DemoTank {
  companySlug: string;
  homeRef: string;
  addressLine: string;
  town: string;
  postcode: string;
  occupants: number;
  hasSolar: boolean;
  contactName: string;
  serial: string;
  model: string;
  volumeL: number;
  heightM: number;
  sensorCount: number;
  declaredLossW: number;
  heatSource: HeatSource;
  hpOutputW: number;
  immersionW: number;
  targetC: number;
  hysteresisK: number;
  tariff: 'flat' | 'time_of_use';
  faults: FaultKind[];
  /** How long ago the cylinder was commissioned, days (spread over three years). */
  commissionedDaysAgo: number;
  /** Days ago of each annual inspection since (oldest first); a few tanks have missed their latest. */
  inspectionsDaysAgo: number[];
}

const streets = ['Mill Lane', 'Church Row', 'Heron Close', 'Quarry Road', 'Orchard Way', 'Station Street', 'Beck Side', 'Willow Drive', 'Tanner Walk', 'Marsh Road'];
const firstNames = ['Ilsa', 'Teodor', 'Marnie', 'Osric', 'Wren', 'Bastian', 'Calla', 'Dorian', 'Fenna', 'Joss', 'Linnea', 'Perrin'];
const lastNames = ['Ashcombe', 'Brackwater', 'Colvane', 'Dunmere', 'Elsworth', 'Farrowdale', 'Greythorn', 'Hollins', 'Ivers', 'Kettleby'];

/** Which demo tanks carry an injected fault by default (by index within Kestrel Vale). */
const defaultFaults: Record<number, FaultKind[]> = {
  7: ['sensor_open'], 19: ['sensor_stuck'], 31: ['sensors_swapped'], 44: ['short_cycle'],
  58: ['network_outage'], 73: ['low_setpoint'], 88: ['immersion_stuck'], 102: ['short_cycle'],
};

export function demoTanks(): DemoTank[] {
  const out: DemoTank[] = [];
  for (const company of demoCompanies) {
    const rand = seededRandom(company.slug === 'kestrel-vale' ? 20261201 : 20261202);
    for (let i = 0; i < company.homeCount; i++) {
      const cyl = pick(rand, cylinderModels);
      const r = rand();
      const heatSource: HeatSource = r < 0.68 ? 'hp_plate' : r < 0.9 ? 'hp_coil' : 'immersion_only';
      const hpOutputW = heatSource === 'immersion_only' ? 0 : pick(rand, [5000, 6000, 7000, 8000]);
      const num = String(i + 1).padStart(4, '0');
      out.push({
        companySlug: company.slug,
        homeRef: `${company.refPrefix}-${num}`,
        addressLine: `${1 + Math.floor(rand() * 120)} ${pick(rand, streets)}`,
        town: pick(rand, company.towns),
        postcode: `WM${1 + Math.floor(rand() * 9)} ${Math.floor(rand() * 9)}${String.fromCharCode(65 + Math.floor(rand() * 26))}${String.fromCharCode(65 + Math.floor(rand() * 26))}`,
        occupants: 1 + Math.floor(rand() * 6),
        hasSolar: rand() < 0.33,
        contactName: `${pick(rand, firstNames)} ${pick(rand, lastNames)}`,
        serial: `${company.serialPrefix}${cyl.model.slice(0, 4)}-${String(100000 + i * 37 + Math.floor(rand() * 30)).padStart(6, '0')}`,
        model: cyl.model,
        volumeL: cyl.volumeL,
        heightM: cyl.heightM,
        sensorCount: cyl.sensorCount,
        declaredLossW: cyl.declaredLossW,
        heatSource,
        hpOutputW,
        immersionW: 3000,
        targetC: heatSource === 'immersion_only' ? 60 : pick(rand, [50, 52, 55, 55, 60]),
        hysteresisK: 5,
        tariff: rand() < 0.45 ? 'time_of_use' : 'flat',
        faults: company.slug === 'kestrel-vale' ? (defaultFaults[i] ?? []) : [],
        ...serviceHistory(i),
      });
    }
  }
  return out;
}

/** Commissioning age and annual inspections for demo tank `i`: derived from the index alone. */
function serviceHistory(i: number): { commissionedDaysAgo: number; inspectionsDaysAgo: number[] } {
  const commissionedDaysAgo = 20 + ((i * 97) % 1100);
  const inspectionsDaysAgo: number[] = [];
  for (let k = 1; k * 365 < commissionedDaysAgo; k++) inspectionsDaysAgo.push(commissionedDaysAgo - k * 365 + ((i * 7) % 11) - 5);
  // About one tank in seventeen has missed its latest inspection (overdue in the demo).
  if (i % 17 === 5 && inspectionsDaysAgo.length > 0) inspectionsDaysAgo.pop();
  return { commissionedDaysAgo, inspectionsDaysAgo: inspectionsDaysAgo.filter((d) => d > 0) };
}

export const demoRoles = ['admin', 'operator', 'engineer', 'householder'] as const;

/** Demo sign-ins: one per role in each company, e.g. operator@kestrelvale.example.com. */
export function demoAccounts(): { email: string; role: (typeof demoRoles)[number]; companySlug: string; name: string }[] {
  return demoCompanies.flatMap((c) =>
    demoRoles.map((role) => ({ email: `${role}@${c.emailDomain}`, role, companySlug: c.slug, name: `Demo ${role} (${c.name})` })),
  );
}
