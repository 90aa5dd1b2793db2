// The ingest contract against the broker and ingest worker processes `npm test` starts
// (scripts/broker.ts and scripts/ingest-worker.ts, as `npm start` runs them).
import { servicePassword } from '../../../src/lib/telemetry/device-token';
import { describeBrokerContract } from './broker-contract';
import { mqttUrl } from './helpers';

describeBrokerContract("Heatlayer's aedes broker and ingest worker processes", 150, async () => ({
  url: mqttUrl(),
  servicePassword: servicePassword(process.env),
  stop: async () => undefined,
}));
