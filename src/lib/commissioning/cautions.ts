// The cautions the wizard, the record and the service pages show. Heatlayer guides; local codes,
// the manufacturer's instructions and a competent person's judgement come first.
import { LEGIONELLA_STORE_C } from './steps';

export const UNVENTED_CAUTION =
  'Unvented hot-water storage is safety-critical: its expansion provision, temperature and pressure relief and discharge pipework protect against bursting and scalding. Installing, commissioning and servicing it is work for a competent, licensed person under local building regulations and the manufacturer’s instructions.';

export const ELECTRICAL_CAUTION =
  'Electrical work on the immersion heater and controls is for a qualified electrician; isolate and prove dead before working on them.';

export const LEGIONELLA_GUIDANCE = `Legionella control (HSE HSG274 Part 2): store hot water at ${LEGIONELLA_STORE_C} °C or above, so that outlets reach at least 50 °C within a minute. If the cylinder is kept cooler, raise it to ${LEGIONELLA_STORE_C} °C or above regularly and record how.`;

export const SCALD_CAUTION = `Water stored at ${LEGIONELLA_STORE_C} °C scalds at the tap in seconds: fit and check thermostatic mixing valves where local codes call for them (baths, showers, basins used by children, older or disabled people).`;

export const ALL_CAUTIONS = [UNVENTED_CAUTION, ELECTRICAL_CAUTION, LEGIONELLA_GUIDANCE, SCALD_CAUTION];
