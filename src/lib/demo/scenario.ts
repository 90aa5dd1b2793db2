import { capabilities, hasHeatPump, type HeatSource } from '../heat-sources';
import { pick, seededRandom } from './random';

/**
 * The invented demo scenario: two service companies, their homes and one cylinder per home.
 * Pure and deterministic: the seed script stores it, the simulator plays it, and both agree
 * on every serial and specification without the simulator reading the database.
 */

export const faultKinds = [
  'sensor_open',
  'sensor_stuck',
  'sensors_swapped',
  'short_cycle',
  'network_outage',
  'low_setpoint',
  'immersion_stuck',
] as const;
export type FaultKind = (typeof faultKinds)[number];

export interface CylinderModel {
  model: string;
  volumeL: number;
  heightM: number;
  sensorCount: number;
  declaredLossW: number;
}

/** Generic, invented cylinder models. Declared losses sit in the range typical of class B/C tanks (demo values). */
const cylinderModels: readonly CylinderModel[] = [
  { model: 'C150 cylinder', volumeL: 150, heightM: 1.05, sensorCount: 8, declaredLossW: 48 },
  { model: 'C180 cylinder', volumeL: 180, heightM: 1.2, sensorCount: 10, declaredLossW: 52 },
  { model: 'C210 cylinder', volumeL: 210, heightM: 1.4, sensorCount: 12, declaredLossW: 57 },
  { model: 'C250 cylinder', volumeL: 250, heightM: 1.6, sensorCount: 14, declaredLossW: 63 },
  { model: 'C300 cylinder', volumeL: 300, heightM: 1.85, sensorCount: 16, declaredLossW: 70 },
];

export interface DemoCompany {
  slug: string;
  name: string;
  emailDomain: string;
  towns: readonly string[];
  homeCount: number;
  refPrefix: string;
  serialPrefix: string;
}

export const demoCompanies: readonly DemoCompany[] = [
  {
    slug: 'kestrel-vale',
    name: 'Kestrel Vale Heating Co-operative',
    emailDomain: 'kestrelvale.example.com',
    towns: ['Ashby Wend', 'Larkholt', 'Cobbmere', 'Tarnfield'],
    homeCount: 240,
    refPrefix: 'KV',
    serialPrefix: 'KV',
  },
  {
    slug: 'orrin-bay',
    name: 'Orrin Bay Energy Services',
    emailDomain: 'orrinbay.example.com',
    towns: ['Orrin Quay', 'Saltmere'],
    homeCount: 24,
    refPrefix: 'OB',
    serialPrefix: 'OB',
  },
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
  /** The householder's address for the record and handover (example.com). */
  contactEmail: string;
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
  /** Whether the latest annual inspection was missed, so the tank is overdue. */
  inspectionMissed: boolean;
  /** The signed commissioning record made on the day (null: installed before the company kept records here). */
  commissioning: DemoCommissioning | null;
}

/** What the engineer recorded at commissioning beyond the tank's specification. */
export interface DemoCommissioning {
  /** Photos attached before sign-off: the data plate, and for some the finished installation. */
  photos: ('data_plate' | 'installation')[];
  externalControl: 'none' | 'programmer';
  /** The heat pump's name and its hot-water sensor input (heat pumps only). */
  heatPump: { name: string; ntcR25Ohm: number; ntcBetaK: number } | null;
  /** The installer's invented registration number. */
  registrationNumber: string;
}

const streets = [
  'Mill Lane',
  'Church Row',
  'Heron Close',
  'Quarry Road',
  'Orchard Way',
  'Station Street',
  'Beck Side',
  'Willow Drive',
  'Tanner Walk',
  'Marsh Road',
];
const firstNames = [
  'Ilsa',
  'Teodor',
  'Marnie',
  'Osric',
  'Wren',
  'Bastian',
  'Calla',
  'Dorian',
  'Fenna',
  'Joss',
  'Linnea',
  'Perrin',
];
const lastNames = [
  'Ashcombe',
  'Brackwater',
  'Colvane',
  'Dunmere',
  'Elsworth',
  'Farrowdale',
  'Greythorn',
  'Hollins',
  'Ivers',
  'Kettleby',
];

/** Which demo tanks carry an injected fault by default (by index within Kestrel Vale). */
const defaultFaults: Record<number, FaultKind[]> = {
  7: ['sensor_open'],
  19: ['sensor_stuck'],
  31: ['sensors_swapped'],
  44: ['short_cycle'],
  58: ['network_outage'],
  73: ['low_setpoint'],
  88: ['immersion_stuck'],
  102: ['short_cycle'],
};

export function demoTanks(): DemoTank[] {
  const out: DemoTank[] = [];
  for (const company of demoCompanies) {
    const rand = seededRandom(company.slug === 'kestrel-vale' ? 20261201 : 20261202);
    for (let i = 0; i < company.homeCount; i++) {
      const cyl = pick(rand, cylinderModels);
      const r = rand();
      const heatSource: HeatSource = r < 0.68 ? 'hp_plate' : r < 0.9 ? 'hp_coil' : 'immersion_only';
      const hpOutputW = hasHeatPump(heatSource) ? pick(rand, [5000, 6000, 7000, 8000]) : 0;
      const num = String(i + 1).padStart(4, '0');
      // Drawn in this order (the sequence fixes every demo value, serials included).
      const addressLine = `${1 + Math.floor(rand() * 120)} ${pick(rand, streets)}`;
      const town = pick(rand, company.towns);
      const postcode = `WM${1 + Math.floor(rand() * 9)} ${Math.floor(rand() * 9)}${String.fromCharCode(65 + Math.floor(rand() * 26))}${String.fromCharCode(65 + Math.floor(rand() * 26))}`;
      const occupants = 1 + Math.floor(rand() * 6);
      const hasSolar = rand() < 0.33;
      const contactName = `${pick(rand, firstNames)} ${pick(rand, lastNames)}`;
      out.push({
        companySlug: company.slug,
        homeRef: `${company.refPrefix}-${num}`,
        addressLine,
        town,
        postcode,
        occupants,
        hasSolar,
        contactName,
        contactEmail: `${contactName.toLowerCase().replace(/\s+/g, '.')}.${company.refPrefix.toLowerCase()}${num}@example.com`,
        serial: `${company.serialPrefix}${cyl.model.slice(0, 4)}-${String(100000 + i * 37 + Math.floor(rand() * 30)).padStart(6, '0')}`,
        model: cyl.model,
        volumeL: cyl.volumeL,
        heightM: cyl.heightM,
        sensorCount: cyl.sensorCount,
        declaredLossW: cyl.declaredLossW,
        heatSource,
        hpOutputW,
        immersionW: 3000,
        targetC: capabilities(heatSource).immersion === 'only' ? 60 : pick(rand, [50, 52, 55, 55, 60]),
        hysteresisK: 5,
        tariff: rand() < 0.45 ? 'time_of_use' : 'flat',
        faults: company.slug === 'kestrel-vale' ? (defaultFaults[i] ?? []) : [],
        ...serviceHistory(i),
        commissioning: commissioningFacts(company, i, heatSource),
      });
    }
  }
  return out;
}

/**
 * Commissioning age and annual inspections for demo tank `i`, derived from the index alone. Each
 * inspection falls a few days before its anniversary (1 to 10; at the latest today), so a tank that kept its visits is
 * never overdue; a few missed their latest, and are overdue by days to weeks.
 */
function serviceHistory(i: number): {
  commissionedDaysAgo: number;
  inspectionsDaysAgo: number[];
  inspectionMissed: boolean;
} {
  const commissionedDaysAgo = 20 + ((i * 97) % 1100);
  const early = 1 + ((i * 7) % 10);
  const inspectionsDaysAgo: number[] = [];
  for (let k = 1; commissionedDaysAgo - k * 365 + early >= 0; k++)
    inspectionsDaysAgo.push(commissionedDaysAgo - k * 365 + early);
  // A few tanks missed the one whose anniversary passed 3 to 75 days ago: overdue by days to weeks.
  const lateDays = commissionedDaysAgo - inspectionsDaysAgo.length * 365;
  const inspectionMissed = i % 5 === 0 && inspectionsDaysAgo.length > 0 && lateDays >= 3 && lateDays <= 75;
  if (inspectionMissed) inspectionsDaysAgo.pop();
  return { commissionedDaysAgo, inspectionsDaysAgo, inspectionMissed };
}

/** Invented heat-pump names and the sensor inputs' NTC curves (10 kΩ and 5 kΩ at 25 °C are usual; demo values). */
const heatPumpNames = ['Air-to-water heat pump (demo)', 'Monobloc heat pump (demo)', 'Split heat pump (demo)'];
const sensorInputs = [
  { ntcR25Ohm: 10_000, ntcBetaK: 3977 },
  { ntcR25Ohm: 5000, ntcBetaK: 3470 },
];

/** The commissioning record of demo tank `i`: seven in eight have one, from the index alone. */
function commissioningFacts(company: DemoCompany, i: number, heatSource: HeatSource): DemoCommissioning | null {
  if (i % 8 === 3) return null;
  return {
    photos: i % 3 === 0 ? ['data_plate'] : ['data_plate', 'installation'],
    externalControl: i % 4 === 1 ? 'programmer' : 'none',
    heatPump: hasHeatPump(heatSource)
      ? { name: heatPumpNames[i % heatPumpNames.length]!, ...sensorInputs[i % sensorInputs.length]! }
      : null,
    registrationNumber: `${company.refPrefix}-INST-${String(4000 + (i % 6) * 17).padStart(5, '0')}`,
  };
}

export const demoRoles = ['admin', 'operator', 'engineer', 'householder'] as const;

/** Demo sign-ins: one per role in each company, e.g. operator@kestrelvale.example.com. */
export function demoAccounts(): {
  email: string;
  role: (typeof demoRoles)[number];
  companySlug: string;
  name: string;
}[] {
  return demoCompanies.flatMap((c) =>
    demoRoles.map((role) => ({
      email: `${role}@${c.emailDomain}`,
      role,
      companySlug: c.slug,
      name: `Demo ${role} (${c.name})`,
    })),
  );
}
